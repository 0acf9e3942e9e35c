1:"$Sreact.fragment"
2:"/_next/static/chunks/08mika-44sn50.js"
3:I[22016,["$2"],""]
4:I[39756,["$2"],"default"]
5:I[37457,["$2"],"default"]
c:I[97367,["$2"],"OutletBoundary"]
d:"$Sreact.suspense"
10:"ViewportBoundary"
11:I[97367,["$2"],"$10"]
12:"MetadataBoundary"
13:I[97367,["$2"],"$12"]
14:I[27201,["$2"],"IconMark"]
:HL["/_next/static/chunks/2zmufb2ztdtq1.css","style"]
7:X
a:X
a:C
b:[["children",{"s":"__PAGE__","h":160,"d":{"r":["$","$1","c",{"children":[[["$","title",null,{"children":"404: This page could not be found."}],["$","div",null,{"style":"$0:t:t:d:r:props:children:1:props:children:props:children:1:props:notFound:0:1:props:style","children":["$","div",null,{"children":[["$","style",null,{"dangerouslySetInnerHTML":{"__html":"body{color:#000;background:#fff;margin:0}.next-error-h1{border-right:1px solid rgba(0,0,0,.3)}@media (prefers-color-scheme:dark){body{color:#fff;background:#000}.next-error-h1{border-right:1px solid rgba(255,255,255,.3)}}"}}],["$","h1",null,{"className":"next-error-h1","style":"$0:t:t:d:r:props:children:1:props:children:props:children:1:props:notFound:0:1:props:children:props:children:1:props:style","children":404}],["$","div",null,{"style":"$0:t:t:d:r:props:children:1:props:children:props:children:1:props:notFound:0:1:props:children:props:children:2:props:style","children":["$","h2",null,{"style":"$0:t:t:d:r:props:children:1:props:children:props:children:1:props:notFound:0:1:props:children:props:children:2:props:children:props:style","children":"This page could not be found."}]}]]}]}]],null,["$","$Lc",null,{"children":["$","$d",null,{"name":"Next.MetadataOutlet","children":"$@e"}]}]]}],"p":"$@f","v":null,"s":"$7"}}]]
8:[["children",{"s":"/_not-found","h":96,"d":{"r":["$","$1","c",{"children":[null,["$","$L4",null,{"parallelRouterKey":"children","template":["$","$L5",null,{}]}]]}],"p":"$@9","v":"$a","s":"$7"},"c":"$Qb"}]]
0:{"t":{"t":{"s":"","h":80,"d":{"r":["$","$1","c",{"children":[[["$","link","0",{"rel":"stylesheet","href":"/_next/static/chunks/2zmufb2ztdtq1.css","precedence":"next"}],["$","script","script-0",{"src":"/_next/static/chunks/08mika-44sn50.js","async":true}]],["$","html",null,{"lang":"en","children":["$","body",null,{"className":"min-h-screen font-sans antialiased","children":[["$","header",null,{"className":"no-print border-b border-hairline bg-white","children":["$","nav",null,{"className":"mx-auto flex h-12 max-w-screen-2xl items-center gap-6 px-4 text-sm","aria-label":"Main","children":[["$","$L3",null,{"href":"/","className":"flex items-center gap-2 font-semibold tracking-tight text-ink","children":[["$","svg",null,{"aria-hidden":true,"viewBox":"0 0 32 32","className":"h-6 w-6","children":[["$","rect",null,{"width":"32","height":"32","rx":"6","fill":"#0F766E"}],["$","path",null,{"d":"M6 20 h5 l3 -9 l4 14 l3 -5 h5","fill":"none","stroke":"#F7F5F0","strokeWidth":"2.4","strokeLinecap":"round","strokeLinejoin":"round"}]]}],"Quell"]}],["$","$L3",null,{"href":"/scenarios","className":"text-ink-muted hover:text-ink","children":"Scenarios"}],["$","$L3",null,{"href":"/library","className":"text-ink-muted hover:text-ink","children":"Library"}]]}]}],["$","$L4",null,{"parallelRouterKey":"children","template":["$","$L5",null,{}],"notFound":[[["$","title",null,{"children":"404: This page could not be found."}],["$","div",null,{"style":{"fontFamily":"system-ui,\"Segoe UI\",Roboto,Helvetica,Arial,sans-serif,\"Apple Color Emoji\",\"Segoe UI Emoji\"","height":"100vh","textAlign":"center","display":"flex","flexDirection":"column","alignItems":"center","justifyContent":"center"},"children":["$","div",null,{"children":[["$","style",null,{"dangerouslySetInnerHTML":{"__html":"body{color:#000;background:#fff;margin:0}.next-error-h1{border-right:1px solid rgba(0,0,0,.3)}@media (prefers-color-scheme:dark){body{color:#fff;background:#000}.next-error-h1{border-right:1px solid rgba(255,255,255,.3)}}"}}],["$","h1",null,{"className":"next-error-h1","style":{"display":"inline-block","margin":"0 20px 0 0","padding":"0 23px 0 0","fontSize":24,"fontWeight":500,"verticalAlign":"top","lineHeight":"49px"},"children":404}],["$","div",null,{"style":{"display":"inline-block"},"children":["$","h2",null,{"style":{"fontSize":14,"fontWeight":400,"lineHeight":"49px","margin":0},"children":"This page could not be found."}]}]]}]}]],[]]}]]}]}]]}],"p":"$@6","v":null,"s":"$7"},"c":"$Q8"},"h":{"r":["$","$1","h",{"children":[["$","meta",null,{"name":"robots","content":"noindex"}],["$","$L11",null,{"children":[["$","meta","0",{"charSet":"utf-8"}],["$","meta","1",{"name":"viewport","content":"width=device-width, initial-scale=1"}]]}],["$","$L13",null,{"children":[["$","div",null,{"hidden":true,"children":["$","$d",null,{"name":"Next.Metadata","children":[["$","title","0",{"children":"Quell"}],["$","meta","1",{"name":"description","content":"Design, check and share op-amp-driven linear current sources and sinks."}],["$","link","2",{"rel":"icon","href":"/icon.svg?icon.2guvs8qkm_lix.svg","sizes":"any","type":"image/svg+xml"}],["$","$L14","3",{}]]}]}],null]}],null]}],"p":"$@15","v":null,"s":"$7"}},"a":"$@16","u":"$@17","b":"Zi0JRs9tf0prs63kPgfpZ"}
e:null
7:300
17:true
7:C
16:0
9:"$undefined"
6:"$undefined"
15:"$undefined"
f:"$undefined"

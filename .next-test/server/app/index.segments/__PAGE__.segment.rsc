1:"$Sreact.fragment"
2:"/_next/static/chunks/08mika-44sn50.js"
3:"/_next/static/chunks/3jbmk0by1-gtu.js"
4:I[22016,["$2","$3"],""]
5:I[39756,["$2"],"default"]
6:I[37457,["$2"],"default"]
a:I[93090,["$2","$3"],"HealthBadge"]
b:I[97367,["$2"],"OutletBoundary"]
c:"$Sreact.suspense"
f:"ViewportBoundary"
10:I[97367,["$2"],"$f"]
11:"MetadataBoundary"
12:I[97367,["$2"],"$11"]
13:I[27201,["$2"],"IconMark"]
:HL["/_next/static/chunks/2zmufb2ztdtq1.css","style"]
8:X
9:[["children",{"s":"__PAGE__","h":160,"d":{"r":["$","$1","c",{"children":[["$","main",null,{"className":"mx-auto max-w-4xl px-6 py-12","children":[["$","h1",null,{"className":"text-3xl font-semibold tracking-tight","children":"Current sources that behave on the bench"}],["$","p",null,{"className":"mt-4 max-w-2xl text-ink-muted","children":"Quell takes an op-amp, a pass transistor and a sense resistor past the textbook I = V·k/R: headroom and compliance at the heaviest load, worst-case dissipation and junction temperature, the DC accuracy budget, and loop stability with real coils, cables and capacitance — then review, sharing and a library of designs the team has measured."}],["$","div",null,{"className":"mt-8 flex gap-3","children":[["$","$L4",null,{"href":"/scenarios","className":"rounded bg-signal px-4 py-2 text-sm font-medium text-white hover:bg-signal-dark","children":"Open scenarios"}],["$","$L4",null,{"href":"/library","className":"rounded border border-hairline bg-white px-4 py-2 text-sm font-medium hover:border-ink-muted","children":"Team library"}]]}],["$","div",null,{"className":"mt-12 rounded border border-hairline bg-white p-4","children":["$","$La",null,{}]}]]}],[["$","script","script-0",{"src":"/_next/static/chunks/3jbmk0by1-gtu.js","async":true}]],["$","$Lb",null,{"children":["$","$c",null,{"name":"Next.MetadataOutlet","children":"$@d"}]}]]}],"p":"$@e","v":null,"s":"$8"}}]]
0:{"t":{"t":{"s":"","h":80,"d":{"r":["$","$1","c",{"children":[[["$","link","0",{"rel":"stylesheet","href":"/_next/static/chunks/2zmufb2ztdtq1.css","precedence":"next"}],["$","script","script-0",{"src":"/_next/static/chunks/08mika-44sn50.js","async":true}]],["$","html",null,{"lang":"en","children":["$","body",null,{"className":"min-h-screen font-sans antialiased","children":[["$","header",null,{"className":"no-print border-b border-hairline bg-white","children":["$","nav",null,{"className":"mx-auto flex h-12 max-w-screen-2xl items-center gap-6 px-4 text-sm","aria-label":"Main","children":[["$","$L4",null,{"href":"/","className":"flex items-center gap-2 font-semibold tracking-tight text-ink","children":[["$","svg",null,{"aria-hidden":true,"viewBox":"0 0 32 32","className":"h-6 w-6","children":[["$","rect",null,{"width":"32","height":"32","rx":"6","fill":"#0F766E"}],["$","path",null,{"d":"M6 20 h5 l3 -9 l4 14 l3 -5 h5","fill":"none","stroke":"#F7F5F0","strokeWidth":"2.4","strokeLinecap":"round","strokeLinejoin":"round"}]]}],"Quell"]}],["$","$L4",null,{"href":"/scenarios","className":"text-ink-muted hover:text-ink","children":"Scenarios"}],["$","$L4",null,{"href":"/library","className":"text-ink-muted hover:text-ink","children":"Library"}]]}]}],["$","$L5",null,{"parallelRouterKey":"children","template":["$","$L6",null,{}],"notFound":[[["$","title",null,{"children":"404: This page could not be found."}],["$","div",null,{"style":{"fontFamily":"system-ui,\"Segoe UI\",Roboto,Helvetica,Arial,sans-serif,\"Apple Color Emoji\",\"Segoe UI Emoji\"","height":"100vh","textAlign":"center","display":"flex","flexDirection":"column","alignItems":"center","justifyContent":"center"},"children":["$","div",null,{"children":[["$","style",null,{"dangerouslySetInnerHTML":{"__html":"body{color:#000;background:#fff;margin:0}.next-error-h1{border-right:1px solid rgba(0,0,0,.3)}@media (prefers-color-scheme:dark){body{color:#fff;background:#000}.next-error-h1{border-right:1px solid rgba(255,255,255,.3)}}"}}],["$","h1",null,{"className":"next-error-h1","style":{"display":"inline-block","margin":"0 20px 0 0","padding":"0 23px 0 0","fontSize":24,"fontWeight":500,"verticalAlign":"top","lineHeight":"49px"},"children":404}],["$","div",null,{"style":{"display":"inline-block"},"children":["$","h2",null,{"style":{"fontSize":14,"fontWeight":400,"lineHeight":"49px","margin":0},"children":"This page could not be found."}]}]]}]}]],[]]}]]}]}]]}],"p":"$@7","v":null,"s":"$8"},"c":"$Q9"},"h":{"r":["$","$1","h",{"children":[null,["$","$L10",null,{"children":[["$","meta","0",{"charSet":"utf-8"}],["$","meta","1",{"name":"viewport","content":"width=device-width, initial-scale=1"}]]}],["$","$L12",null,{"children":[["$","div",null,{"hidden":true,"children":["$","$c",null,{"name":"Next.Metadata","children":[["$","title","0",{"children":"Quell"}],["$","meta","1",{"name":"description","content":"Design, check and share op-amp-driven linear current sources and sinks."}],["$","link","2",{"rel":"icon","href":"/icon.svg?icon.2guvs8qkm_lix.svg","sizes":"any","type":"image/svg+xml"}],["$","$L13","3",{}]]}]}],null]}],null]}],"p":"$@14","v":null,"s":"$8"}},"a":"$@15","u":"$@16","b":"Zi0JRs9tf0prs63kPgfpZ"}
d:null
8:300
16:true
8:C
15:0
7:"$undefined"
14:"$undefined"
e:"$undefined"

:HL["/_next/static/chunks/2zmufb2ztdtq1.css","style"]
:HC["/",""]
1:[["children",{"s":"__PAGE__","h":160}]]
0:{"b":"Zi0JRs9tf0prs63kPgfpZ","t":{"t":{"s":"","h":80,"c":"$Q1"}}}

:HL["/_next/static/chunks/2zmufb2ztdtq1.css","style"]
2:[["children",{"s":"__PAGE__","h":160}]]
1:[["children",{"s":"/_not-found","h":96,"c":"$Q2"}]]
0:{"b":"Zi0JRs9tf0prs63kPgfpZ","t":{"t":{"s":"","h":80,"c":"$Q1"}}}

1:[["children",{"s":"__PAGE__","h":176}]]
0:{"b":"Zi0JRs9tf0prs63kPgfpZ","t":{"t":{"s":"","h":80,"c":"$Q1"}}}

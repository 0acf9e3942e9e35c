globalThis.__BUILD_MANIFEST = {
  "pages": {
    "/_app": []
  },
  "devFiles": [],
  "polyfillFiles": [
    "static/chunks/0cz1d0mv5g_q7.js"
  ],
  "lowPriorityFiles": [
    "static/Zi0JRs9tf0prs63kPgfpZ/_buildManifest.js",
    "static/Zi0JRs9tf0prs63kPgfpZ/_ssgManifest.js",
    "static/Zi0JRs9tf0prs63kPgfpZ/_clientMiddlewareManifest.js"
  ],
  "rootMainFiles": [
    "static/chunks/310vm2bl3xxpt.js",
    "static/chunks/1wnov70f88xjy.js",
    "static/chunks/39_j1bdzreq0m.js",
    "static/chunks/0c1ad7rcpjghx.js",
    "static/chunks/turbopack-077hmtqrhcoji.js"
  ],
  "rootMainFilesTree": {},
  "pagesChunkGroupBootstrapParams": {
    "/page": {
      "otherChunks": [
        "static/chunks/310vm2bl3xxpt.js",
        "static/chunks/1wnov70f88xjy.js",
        "static/chunks/39_j1bdzreq0m.js",
        "static/chunks/0c1ad7rcpjghx.js"
      ],
      "runtimeModuleIds": [
        94553
      ]
    },
    "/_not-found/page": {
      "otherChunks": [
        "static/chunks/310vm2bl3xxpt.js",
        "static/chunks/1wnov70f88xjy.js",
        "static/chunks/39_j1bdzreq0m.js",
        "static/chunks/0c1ad7rcpjghx.js"
      ],
      "runtimeModuleIds": [
        94553
      ]
    },
    "/_global-error/page": {
      "otherChunks": [
        "static/chunks/310vm2bl3xxpt.js",
        "static/chunks/1wnov70f88xjy.js",
        "static/chunks/39_j1bdzreq0m.js",
        "static/chunks/0c1ad7rcpjghx.js"
      ],
      "runtimeModuleIds": [
        94553
      ]
    }
  },
  "chunkLoadingGlobal": "TURBOPACK"
};

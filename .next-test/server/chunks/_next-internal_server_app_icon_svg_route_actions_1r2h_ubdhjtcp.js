module.exports=[60722,s=>{"use strict";s.s([])}];

//# sourceMappingURL=_next-internal_server_app_icon_svg_route_actions_1r2h_ubdhjtcp.js.map
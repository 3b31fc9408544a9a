import { h, type VNode } from 'vue'
import type { Area } from '@shared/auth/roles'

/** Line glyphs of our own for the navigation, 20 px on a 24 grid. */
const PATHS: Record<Area | 'account', string> = {
  overview: 'M4 13h6V4H4zM14 20h6v-9h-6zM4 20h6v-4H4zM14 4v4h6V4z',
  calibration: 'M4 20L20 4M4 20h16M4 20V4M8 14l2-2M13 9l2-2',
  'starting-factors': 'M5 19V9M12 19V5M19 19v-7M3 19h18',
  precedents: 'M4 6h10M4 12h16M4 18h7M17 15l3 3-3 3',
  projects: 'M5 3h10l4 4v14H5zM15 3v4h4M8 12h8M8 16h6',
  benchmarks: 'M4 20h16M6 16v-4M10 16V8M14 16v-6M18 16V5',
  'new-frame': 'M4 20V4h16v16zM4 20L12 4l8 16M12 12v8',
  imports: 'M12 3v12M7 10l5 5 5-5M4 17v3h16v-3',
  admin: 'M12 3l8 4v5c0 5-3.5 8-8 9-4.5-1-8-4-8-9V7zM9 12l2 2 4-4',
  account: 'M12 12a4 4 0 100-8 4 4 0 000 8zM4 21c1-4 4-6 8-6s7 2 8 6',
}

export function areaIcon(area: Area | 'account'): () => VNode {
  return () =>
    h(
      'svg',
      { viewBox: '0 0 24 24', width: 20, height: 20, fill: 'none', stroke: 'currentColor', 'stroke-width': 1.8, 'stroke-linecap': 'round', 'stroke-linejoin': 'round', 'aria-hidden': 'true' },
      [h('path', { d: PATHS[area] })],
    )
}

import type { App, ComponentPublicInstance, Directive } from 'vue'

/**
 * Accessibility repairs for two naive-ui internals the dashboard cannot reach through props.
 * Both only add or change ARIA attributes that the library's own render leaves alone, so Vue's
 * patching keeps them (it writes an attribute only when its own value for it changes).
 */

/**
 * naive-ui's NCard renders its title as two nested `role="heading"` divs with no `aria-level`
 * (screen readers then announce two headings of an unknown level). Make the outer one
 * presentational and give the inner one a level: 2 under the page's h1, one more per enclosing card.
 */
export function fixCardHeadings(root: Element) {
  for (const header of Array.from(root.querySelectorAll('.n-card-header[role=heading]'))) header.setAttribute('role', 'none')
  for (const main of Array.from(root.querySelectorAll('.n-card-header__main[role=heading]'))) {
    if (main.hasAttribute('aria-level')) continue
    let depth = 0
    for (let el = main.parentElement?.closest('.n-card') ?? null; el; el = el.parentElement?.closest('.n-card') ?? null) depth++
    main.setAttribute('aria-level', String(Math.min(6, 1 + depth)))
  }
}

let tabsSeq = 0

/**
 * naive-ui's NTabs renders its tabs as plain divs: no tab roles, not focusable, no keys. Give them the
 * WAI-ARIA tabs pattern (APG "Tabs with automatic activation"): a tablist of tabs with aria-selected, the
 * selected tab in the Tab order (the others at -1), Arrow keys / Home / End move and select, Enter and
 * Space select; the shown pane is a tabpanel labelled by its tab. Nested tab sets are left to their own NTabs.
 */
export function fixTabs(root: HTMLElement) {
  const own = (sel: string) => Array.from(root.querySelectorAll<HTMLElement>(sel)).filter(e => e.closest('.n-tabs') === root)
  const base = (root.dataset.tabsId ??= `tabs-${++tabsSeq}`)
  for (const list of own('.n-tabs-wrapper')) list.setAttribute('role', 'tablist')
  for (const w of own('.n-tabs-tab-wrapper, .n-tabs-tab-pad, .n-tabs-bar')) w.setAttribute('role', 'none')
  let activeId = ''
  for (const t of own('.n-tabs-tab')) {
    const active = t.classList.contains('n-tabs-tab--active')
    t.setAttribute('role', 'tab')
    t.id = `${base}-${t.dataset.name ?? ''}`
    t.setAttribute('aria-selected', String(active))
    t.tabIndex = active ? 0 : -1
    if (t.classList.contains('n-tabs-tab--disabled')) t.setAttribute('aria-disabled', 'true')
    if (active) activeId = t.id
  }
  for (const pane of own('.n-tab-pane')) {
    pane.setAttribute('role', 'tabpanel')
    if (activeId && getComputedStyle(pane).display !== 'none') pane.setAttribute('aria-labelledby', activeId)
  }
  if (root.dataset.tabsKeys) return
  root.dataset.tabsKeys = 'on'
  root.addEventListener('keydown', e => {
    const tab = (e.target as HTMLElement | null)?.closest<HTMLElement>('[role=tab]')
    if (!tab || tab.closest('.n-tabs') !== root) return
    const tabs = own('.n-tabs-tab').filter(t => !t.classList.contains('n-tabs-tab--disabled'))
    const i = tabs.indexOf(tab)
    const next = { ArrowRight: tabs[(i + 1) % tabs.length], ArrowLeft: tabs[(i - 1 + tabs.length) % tabs.length], Home: tabs[0], End: tabs.at(-1) }[e.key]
    if (next) {
      e.preventDefault()
      next.focus()
      next.click()
    } else if (e.key === 'Enter' || e.key === ' ') {
      e.preventDefault()
      tab.click()
    }
  })
}

/** Installs `fixCardHeadings` on every NCard and `fixTabs` on every NTabs as they mount and re-render. */
export const naiveA11y = {
  install(app: App) {
    const run = (vm: ComponentPublicInstance) => {
      if (!(vm.$el instanceof HTMLElement)) return
      if (vm.$options.name === 'Card') fixCardHeadings(vm.$el)
      else if (vm.$options.name === 'Tabs') fixTabs(vm.$el)
    }
    app.mixin({
      mounted(this: ComponentPublicInstance) {
        run(this)
      },
      updated(this: ComponentPublicInstance) {
        run(this)
      },
    })
  },
}

/**
 * `v-slider-label="'Percentile'"` on an NSlider: names its handle(s) (`role="slider"`), which the
 * component gives no way to label.
 */
export const vSliderLabel: Directive<HTMLElement, string> = {
  mounted: (el, { value }) => labelSliders(el, value),
  updated: (el, { value }) => labelSliders(el, value),
}

function labelSliders(el: HTMLElement, label: string) {
  for (const handle of Array.from(el.querySelectorAll('[role=slider]'))) handle.setAttribute('aria-label', label)
}

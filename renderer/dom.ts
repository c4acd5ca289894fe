/** A DOM element with properties set and children appended: the one element builder of the renderer. */
export function el<K extends keyof HTMLElementTagNameMap>(tag: K, props: Partial<HTMLElementTagNameMap[K]> = {}, ...children: (Node | string)[]): HTMLElementTagNameMap[K] {
  const e = Object.assign(document.createElement(tag), props);
  e.append(...children);
  return e;
}

/**
 * Calls `onChange` whenever the theme (the root element's data-theme, set by the Theme button)
 * changes: for what draws with the theme's colours into canvases, which CSS alone cannot restyle.
 * Returns the observer, to disconnect when its owner goes.
 */
export function watchTheme(onChange: () => void): MutationObserver {
  const watch = new MutationObserver(onChange);
  watch.observe(document.documentElement, { attributes: true, attributeFilter: ['data-theme'] });
  return watch;
}

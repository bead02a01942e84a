/**
 * The renderer's text rules (issue 10), checked on the rendered DOM: every visible text (text
 * nodes, and the values shown in inputs and selects) at least 13 px, and its colour against the
 * nearest opaque background at least 4.5:1 (3:1 for disabled controls) by the WCAG 2.x contrast
 * ratio: relative luminance L = 0.2126 R + 0.7152 G + 0.0722 B of linearised sRGB channels
 * (c ≤ 0.04045 ? c/12.92 : ((c + 0.055)/1.055)^2.4) and ratio (L1 + 0.05)/(L2 + 0.05)
 * (W3C, Web Content Accessibility Guidelines 2.1, definitions "relative luminance" and
 * "contrast ratio"). Translucent backgrounds are composited over their ancestors' down to the
 * first opaque one; text colour alpha is composited over that background.
 *
 * Kept as plain JavaScript text so the page runs it as written (no bundler helpers inside).
 */
export interface TextViolation {
  /** A short CSS-like path to the element ("aside.left > div.section > label"). */
  where: string;
  text: string;
  rule: 'size' | 'contrast';
  value: number;
  needed: number;
}

export const TEXT_RULES_SCRIPT = String.raw`(() => {
  const MIN_PX = 13;
  function parse(c) {
    const m = c.match(/rgba?\(([^)]+)\)/);
    if (!m) return [0, 0, 0, 0];
    const p = m[1].split(/[ ,/]+/).filter(Boolean).map(Number);
    return [p[0], p[1], p[2], p.length > 3 ? p[3] : 1];
  }
  function over(top, bottom) {
    const a = top[3] + bottom[3] * (1 - top[3]);
    if (a === 0) return [0, 0, 0, 0];
    const mix = (i) => (top[i] * top[3] + bottom[i] * bottom[3] * (1 - top[3])) / a;
    return [mix(0), mix(1), mix(2), a];
  }
  function lum(c) {
    const f = (v) => {
      const s = v / 255;
      return s <= 0.04045 ? s / 12.92 : Math.pow((s + 0.055) / 1.055, 2.4);
    };
    return 0.2126 * f(c[0]) + 0.7152 * f(c[1]) + 0.0722 * f(c[2]);
  }
  function ratio(a, b) {
    const la = lum(a), lb = lum(b);
    return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05);
  }
  function background(el) {
    const layers = [];
    for (let e = el; e; e = e.parentElement) {
      const c = parse(getComputedStyle(e).backgroundColor);
      if (c[3] > 0) layers.push(c);
      if (c[3] >= 1) break;
    }
    let bg = [255, 255, 255, 1];
    for (let i = layers.length - 1; i >= 0; i--) bg = over(layers[i], bg);
    return bg;
  }
  function where(el) {
    const parts = [];
    for (let e = el; e && e !== document.body && parts.length < 5; e = e.parentElement) {
      let s = e.tagName.toLowerCase();
      if (e.dataset && e.dataset.testid) s += '[data-testid=' + e.dataset.testid + ']';
      else if (typeof e.className === 'string' && e.className.trim()) s += '.' + e.className.trim().split(/\s+/).slice(0, 2).join('.');
      parts.unshift(s);
    }
    return parts.join(' > ');
  }
  function visible(el) {
    const r = el.getBoundingClientRect();
    if (r.width < 1 || r.height < 1) return false;
    if (r.bottom <= 0 || r.right <= 0 || r.top >= innerHeight || r.left >= innerWidth) return false;
    for (let e = el; e; e = e.parentElement) {
      const s = getComputedStyle(e);
      if (s.visibility === 'hidden' || s.display === 'none' || Number(s.opacity) === 0) return false;
    }
    return true;
  }
  function disabled(el) {
    for (let e = el; e; e = e.parentElement) if (e.matches && e.matches(':disabled, [aria-disabled=true]')) return true;
    return false;
  }
  const seen = new Set();
  const out = [];
  function check(el, text) {
    if (seen.has(el) || !visible(el)) return;
    seen.add(el);
    const s = getComputedStyle(el);
    const size = parseFloat(s.fontSize);
    const t = text.trim().slice(0, 40);
    if (size < MIN_PX - 0.01) out.push({ where: where(el), text: t, rule: 'size', value: size, needed: MIN_PX });
    const bg = background(el);
    const fg = over(parse(s.color), bg);
    const need = disabled(el) ? 3 : 4.5;
    const r = ratio(fg, bg);
    if (r < need - 0.005) out.push({ where: where(el), text: t, rule: 'contrast', value: Math.round(r * 100) / 100, needed: need });
  }
  const walker = document.createTreeWalker(document.body, NodeFilter.SHOW_TEXT);
  for (let n = walker.nextNode(); n; n = walker.nextNode()) {
    if (!n.textContent || !n.textContent.trim()) continue;
    const el = n.parentElement;
    if (!el || el.closest('option, script, style, noscript, svg, canvas')) continue;
    check(el, n.textContent);
  }
  for (const el of document.querySelectorAll('input:not([type=checkbox]):not([type=radio]):not([type=range]), select, textarea')) {
    const v = el.tagName === 'SELECT' ? (el.selectedOptions[0] ? el.selectedOptions[0].text : '') : el.value;
    if (v && v.trim()) check(el, v);
  }
  return out;
})()`;

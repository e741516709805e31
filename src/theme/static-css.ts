// Build-time only (vite.config.ts runs it in Node): the CSS PrimeVue's styled mode would write into
// <style> elements at run time, worked out once from our preset. The browser then gets plain CSS
// with the chunk that uses each component, and no JavaScript for tokens, presets or stylesheet text
// (PrimeVue runs with theme 'none', so it injects nothing of its own but its small base rules).
// Each function repeats what PrimeVue's BaseComponent does in _loadThemeStyles, with the same helpers,
// so the rules are the ones it would have written; variables no rule reads are left out.
import { css, Theme } from '@primeuix/styled';
import { minifyCSS } from '@primeuix/utils/object';
import BaseStyle from '@primevue/core/base/style';
import { RigshelfPreset, THEME_OPTIONS } from './preset.ts';

Theme.setTheme({ preset: RigshelfPreset, options: THEME_OPTIONS });

type StyleText = string | ((o: { dt: unknown }) => string) | undefined;

/** BaseStyle.load: the text through `css`, then the transform, then minified. */
function load(style: StyleText, transform: (computed: string) => string = (s) => s): string {
  return (
    minifyCSS(
      transform(
        css`
          ${style}
        ` ?? '',
      ),
    ) ?? ''
  );
}

/** BaseStyle.loadStyle: the component's own rules followed by the preset's extra rules for it. */
function loadStyle(name: string, own: StyleText, extra: StyleText): string {
  return load(own, (computed) =>
    Theme.transformCSS(
      name,
      `${computed}${css`
        ${extra}
      `}`,
    ),
  );
}

function commonSheets(): string[] {
  const { primitive, semantic, global, style } = Theme.getCommon('base', undefined) as Record<string, { css?: string }> & { style?: string };
  const globalStyle = loadStyle('global-style', (BaseStyle as { style?: StyleText }).style, style);
  // PrimeVue writes these rules before any component's, so a component's own rule of the same weight
  // wins (a checkbox's icon size over every icon's). Here they travel in the entry's stylesheet, which
  // comes after the chunks' sheets, so a cascade layer keeps them under every rule that is not in one.
  return [load(primitive?.css), load(semantic?.css), load(global?.css), globalStyle && `@layer primevue-global{${globalStyle}}`];
}

async function componentSheets(dir: string): Promise<string[]> {
  const style = ((await import(`primevue/${dir}/style`)) as { default: { name: string; style?: StyleText } }).default;
  const theme = Theme.getComponent(style.name, undefined) as { css?: string; style?: string } | undefined;
  return [load(theme?.css), loadStyle(`${style.name}-style`, style.style, theme?.style)];
}

const DECLARATION = /(--p-[\w-]+):([^;{}]*)(;|(?=\}))/g;
const REFERENCE = /var\((--p-[\w-]+)/g;

let kept: Promise<Set<string>> | null = null;
/**
 * Every variable a rule of the common sheet, of a component with a token set in the preset or of the
 * app's own styles (`appStyles`: the text of src/) reads, and every variable those read in turn. The
 * rest (most of Aura's palette) is never used.
 */
function keptVariables(appStyles: string): Promise<Set<string>> {
  kept ??= (async () => {
    const components = Object.keys((RigshelfPreset as { components?: object }).components ?? {});
    const text = [...commonSheets(), ...(await Promise.all(components.map(componentSheets))).flat(), appStyles].join('\n');
    const values = new Map<string, string>();
    for (const [, name, value] of text.matchAll(DECLARATION)) values.set(name, `${values.get(name) ?? ''} ${value}`);
    const rules = text.replace(DECLARATION, '');
    const keep = new Set<string>();
    const visit = (from: string) => {
      for (const [, name] of from.matchAll(REFERENCE)) {
        if (keep.has(name)) continue;
        keep.add(name);
        visit(values.get(name) ?? '');
      }
    };
    visit(rules);
    return keep;
  })();
  return kept;
}

async function prune(sheets: string[], appStyles: string): Promise<string> {
  const keep = await keptVariables(appStyles);
  return sheets
    .map((sheet) => sheet.replace(DECLARATION, (whole, name: string) => (keep.has(name) ? whole : '')).replace(/[^{}]+\{\}/g, ''))
    .filter(Boolean)
    .join('\n');
}

/** The palette, semantic tokens and Aura's global rules: what the first component mounted loads. */
export function commonCss(appStyles = ''): Promise<string> {
  return prune(commonSheets(), appStyles);
}

/**
 * One component's token variables and rules, from its `primevue/<dir>/style` module (which knows
 * its theme name and imports its rules from `@primeuix/styles`). Empty for a component without either.
 */
export async function componentCss(dir: string, appStyles = ''): Promise<string> {
  return prune(await componentSheets(dir), appStyles);
}

// Rigshelf's own look: a deep "cyc green" primary, warm "gaffer amber" for cautions, and slate
// surfaces with high contrast so screens stay readable on a cart in daylight.
import base from '@primeuix/themes/aura/base';
import css from '@primeuix/themes/aura/css';
import button from '@primeuix/themes/aura/button';
import checkbox from '@primeuix/themes/aura/checkbox';
import chip from '@primeuix/themes/aura/chip';
import confirmdialog from '@primeuix/themes/aura/confirmdialog';
import dialog from '@primeuix/themes/aura/dialog';
import iconfield from '@primeuix/themes/aura/iconfield';
import inputnumber from '@primeuix/themes/aura/inputnumber';
import inputtext from '@primeuix/themes/aura/inputtext';
import menu from '@primeuix/themes/aura/menu';
import message from '@primeuix/themes/aura/message';
import multiselect from '@primeuix/themes/aura/multiselect';
import password from '@primeuix/themes/aura/password';
import select from '@primeuix/themes/aura/select';
import selectbutton from '@primeuix/themes/aura/selectbutton';
import skeleton from '@primeuix/themes/aura/skeleton';
import tabs from '@primeuix/themes/aura/tabs';
import tag from '@primeuix/themes/aura/tag';
import textarea from '@primeuix/themes/aura/textarea';
import toast from '@primeuix/themes/aura/toast';
import togglebutton from '@primeuix/themes/aura/togglebutton';
import toggleswitch from '@primeuix/themes/aura/toggleswitch';
import { definePreset } from '@primeuix/themes';

export const cycGreen = {
  50: '#eef7f5',
  100: '#d5ebe6',
  200: '#abd5cc',
  300: '#78b8ab',
  400: '#4a988a',
  500: '#2f7c6f',
  600: '#236459',
  700: '#1d5149',
  800: '#19423c',
  900: '#163733',
  950: '#0b1f1c',
};

export const gafferAmber = {
  50: '#fff8eb',
  100: '#fdebc6',
  200: '#fad58a',
  300: '#f6bb4c',
  400: '#f2a524',
  500: '#dc860e',
  600: '#b86509',
  700: '#92490c',
  800: '#783b11',
  900: '#653212',
  950: '#3a1805',
};

const slateInk = {
  0: '#ffffff',
  50: '#f5f7f7',
  100: '#e9eded',
  200: '#d3dada',
  300: '#b1bcbc',
  400: '#869595',
  500: '#657575',
  600: '#4f5d5d',
  700: '#404b4c',
  800: '#2c3435',
  900: '#1c2223',
  950: '#111516',
};

// Aura's base with the tokens of the components the app uses (and of those they are built from),
// not all of Aura's ~90 sets: the whole preset is a third of the first load's JavaScript.
// Using a new PrimeVue component? Add its set here, or it renders without its colours and sizes.
const Aura = {
  ...base,
  components: {
    button,
    checkbox,
    chip,
    confirmdialog,
    dialog,
    iconfield,
    inputnumber,
    inputtext,
    menu,
    message,
    multiselect,
    password,
    select,
    selectbutton,
    skeleton,
    tabs,
    tag,
    textarea,
    toast,
    togglebutton,
    toggleswitch,
  },
  css,
} as unknown as Parameters<typeof definePreset>[0]; // aura/css is typed as a named export but ships as the default

/** PrimeVue's theme options for the preset: `p-` names, no CSS layer. */
export const THEME_OPTIONS = { prefix: 'p', darkModeSelector: '.rs-dark', cssLayer: false } as const;

export const RigshelfPreset = definePreset(Aura, {
  primitive: {
    borderRadius: { none: '0', xs: '2px', sm: '3px', md: '5px', lg: '7px', xl: '10px' },
  },
  semantic: {
    primary: cycGreen,
    focusRing: { width: '3px', style: 'solid', color: gafferAmber[400], offset: '2px' },
    formField: { paddingX: '0.85rem', paddingY: '0.7rem' },
    colorScheme: {
      light: {
        surface: slateInk,
        primary: { color: cycGreen[700], contrastColor: '#ffffff', hoverColor: cycGreen[800], activeColor: cycGreen[900] },
        highlight: { background: cycGreen[100], focusBackground: cycGreen[200], color: cycGreen[900], focusColor: cycGreen[950] },
        text: { color: slateInk[950], mutedColor: slateInk[600], hoverColor: slateInk[900] },
        // a placeholder stays a hint on a field with a message under it, not red text that looks typed
        formField: { invalidPlaceholderColor: slateInk[500] },
      },
      dark: {
        surface: slateInk,
        primary: { color: cycGreen[300], contrastColor: cycGreen[950], hoverColor: cycGreen[200], activeColor: cycGreen[100] },
        highlight: { background: 'rgba(120, 184, 171, 0.18)', focusBackground: 'rgba(120, 184, 171, 0.28)', color: '#ffffff', focusColor: '#ffffff' },
      },
    },
  },
  // Aura's light tints put text at 3.8–4.4:1; each text colour here is one or two steps darker so
  // every label reaches WCAG 2.1 AA (4.5:1) on its own background (checked by axe in the browser tests).
  components: {
    togglebutton: { colorScheme: { light: { root: { color: slateInk[600] }, icon: { color: slateInk[600] } } } },
    message: {
      colorScheme: {
        light: {
          info: { color: '{blue.800}', outlined: { color: '{blue.800}' }, simple: { color: '{blue.800}' } },
          success: { color: '{green.800}', outlined: { color: '{green.800}' }, simple: { color: '{green.800}' } },
          warn: { color: gafferAmber[800], outlined: { color: gafferAmber[800] }, simple: { color: gafferAmber[800] } },
          error: { color: '{red.700}', outlined: { color: '{red.700}' }, simple: { color: '{red.700}' } },
          secondary: { color: slateInk[700], outlined: { color: slateInk[700] }, simple: { color: slateInk[700] } },
        },
      },
    },
    button: {
      colorScheme: {
        light: {
          text: {
            secondary: { color: slateInk[700] },
            success: { color: '{green.800}' },
            info: { color: '{sky.800}' },
            warn: { color: gafferAmber[800] },
            help: { color: '{purple.700}' },
            danger: { color: '{red.700}' },
          },
          outlined: {
            secondary: { color: slateInk[700] },
            success: { color: '{green.800}' },
            info: { color: '{sky.800}' },
            warn: { color: gafferAmber[800] },
            help: { color: '{purple.700}' },
            danger: { color: '{red.700}' },
          },
        },
      },
    },
  },
});

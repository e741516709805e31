// PrimeVue's Password marks its input as a popup owner (aria-expanded, aria-haspopup) for a strength
// overlay we never show; those attributes are not allowed on a password input (axe: aria-allowed-attr).
export const PASSWORD_INPUT_PROPS = { 'aria-expanded': undefined, 'aria-haspopup': undefined };

// PrimeVue 4 ships these two buses without types; App.vue listens on them until Toast and
// ConfirmDialog are loaded.
declare module 'primevue/toasteventbus' {
  const bus: {
    on(event: string, handler: (payload: unknown) => void): void;
    off(event: string, handler: (payload: unknown) => void): void;
    emit(event: string, payload?: unknown): void;
  };
  export default bus;
}
declare module 'primevue/confirmationeventbus' {
  const bus: {
    on(event: string, handler: (payload: unknown) => void): void;
    off(event: string, handler: (payload: unknown) => void): void;
    emit(event: string, payload?: unknown): void;
  };
  export default bus;
}

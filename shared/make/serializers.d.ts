// The JSCAD serializers ship no types; this is the part of their API Rigshelf uses.
declare module '@jscad/stl-serializer' {
  const serializer: {
    serialize(options: { binary?: boolean }, ...objects: unknown[]): (ArrayBuffer | string)[];
  };
  export default serializer;
}

declare module '@jscad/3mf-serializer' {
  const serializer: {
    serialize(
      options: { unit?: 'micron' | 'millimeter' | 'centimeter' | 'inch' | 'foot' | 'meter'; metadata?: boolean; compress?: boolean },
      ...objects: unknown[]
    ): (ArrayBuffer | string)[];
  };
  export default serializer;
}

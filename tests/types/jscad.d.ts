// @jscad/stl-serializer ships no types; this is the part of its API the tests use.
declare module '@jscad/stl-serializer' {
  const serializer: {
    serialize(options: { binary?: boolean }, ...objects: unknown[]): (ArrayBuffer | string)[];
  };
  export default serializer;
}

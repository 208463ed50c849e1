declare module 'jsts';

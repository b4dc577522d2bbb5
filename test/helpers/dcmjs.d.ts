// dcmjs 0.51 ships no types; the tests use only its dataset writer.
declare module 'dcmjs';

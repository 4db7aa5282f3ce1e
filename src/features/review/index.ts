// What other features may use of this one besides its api/ hooks.
export { RESERVED_KEYS, codeKeyMap, keyOfCode } from './keyboard';

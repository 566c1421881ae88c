// The metadata sheet's words are made by @psiform/print (figure-files.ts), the one owner the Studio's preflight also uses.
export { altOf, figureWords } from '@psiform/print';

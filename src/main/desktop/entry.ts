// package.json "main" (out/main/index.js): only loads the desktop shell, which electron-vite puts in
// out/main/desktop/ so that paths three folders up reach the project (electron.vite.config.ts).
import './index.js';

/**
 * Entry of the browser preview (`npm run preview`): the same pane, data from files or samples.
 * It never loads office.js, so no request leaves localhost.
 */
import { App } from './app.js';
import { PreviewData } from './preview-mode.js';

const app = new App('preview');
new PreviewData(app);

import { cleanup } from '@testing-library/react';
import { afterEach } from 'vitest';

// Testing Library unmounts on its own only where the runner's hooks are globals; here they are not.
afterEach(cleanup);

// jsdom has no modal dialogs: open and close them as the attribute says
HTMLDialogElement.prototype.showModal ??= function (this: HTMLDialogElement) {
  this.setAttribute('open', '');
};
HTMLDialogElement.prototype.close ??= function (this: HTMLDialogElement) {
  this.removeAttribute('open');
};

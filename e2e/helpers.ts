import type { Page } from '@playwright/test';

/** Every request the page makes must stay on the local server (local-first: no data leaves the machine). */
export function watchOrigins(page: Page, baseURL: string): string[] {
  const foreign: string[] = [];
  const origin = new URL(baseURL).origin;
  page.on('request', (request) => {
    const url = new URL(request.url());
    if (url.protocol !== 'data:' && url.protocol !== 'blob:' && url.origin !== origin) foreign.push(request.url());
  });
  return foreign;
}

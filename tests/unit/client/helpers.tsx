import { act, type ReactNode } from 'react';
import { createRoot, type Root } from 'react-dom/client';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { vi } from 'vitest';
import { ToastProvider } from '@/components/ui/toast';

(globalThis as { IS_REACT_ACT_ENVIRONMENT?: boolean }).IS_REACT_ACT_ENVIRONMENT = true;

const mounted: Array<{ root: Root; container: HTMLElement }> = [];

/** Renders `ui` at `path` inside the app's providers, with a memory router and a fresh query cache. */
export async function render(ui: ReactNode, { path = '/' }: { path?: string } = {}) {
  const queryClient = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  const router = createMemoryRouter([{ path: '*', element: ui }], { initialEntries: [path] });
  const container = document.createElement('div');
  document.body.appendChild(container);
  const root = createRoot(container);
  mounted.push({ root, container });
  await act(async () => {
    root.render(
      <QueryClientProvider client={queryClient}>
        <ToastProvider>
          <RouterProvider router={router} />
        </ToastProvider>
      </QueryClientProvider>,
    );
  });
  return { container, queryClient, router };
}

export async function cleanup() {
  for (const { root, container } of mounted.splice(0)) {
    await act(async () => root.unmount());
    container.remove();
  }
}

/** The form control a <label> (or aria-label) names, like a browser test's getByLabel. */
export function getByLabel(scope: ParentNode, name: string): HTMLElement {
  for (const label of Array.from(scope.querySelectorAll('label'))) {
    if (label.textContent?.trim() === name && label.htmlFor) {
      const control = document.getElementById(label.htmlFor);
      if (control) return control;
    }
  }
  const labelled = scope.querySelector(`[aria-label="${CSS.escape(name)}"]`);
  if (labelled instanceof HTMLElement) return labelled;
  throw new Error(`No control labelled "${name}"`);
}

export function getButton(scope: ParentNode, name: string): HTMLButtonElement {
  const button = Array.from(scope.querySelectorAll('button')).find(
    (b) => (b.getAttribute('aria-label') ?? b.textContent?.trim()) === name,
  );
  if (!button) throw new Error(`No button named "${name}"`);
  return button;
}

/** Types into an input the way React notices: through the native value setter, then an input event. */
export async function type(element: HTMLElement, value: string) {
  const proto = element instanceof HTMLTextAreaElement ? HTMLTextAreaElement.prototype : HTMLInputElement.prototype;
  const setter = Object.getOwnPropertyDescriptor(proto, 'value')?.set;
  await act(async () => {
    setter?.call(element, value);
    element.dispatchEvent(new Event('input', { bubbles: true }));
  });
}

export async function click(element: HTMLElement) {
  await act(async () => {
    element.click();
  });
}

export async function waitFor<T>(check: () => T, timeoutMs = 2000): Promise<T> {
  const started = Date.now();
  let lastError: unknown;
  while (Date.now() - started < timeoutMs) {
    try {
      return check();
    } catch (error) {
      lastError = error;
    }
    await act(async () => {
      await new Promise((resolve) => setTimeout(resolve, 20));
    });
  }
  throw lastError;
}

export function jsonResponse(body: unknown, status = 200, headers: Record<string, string> = {}) {
  return new Response(body === undefined ? null : JSON.stringify(body), {
    status,
    headers: { 'content-type': 'application/json', ...headers },
  });
}

type Handler = (init: RequestInit | undefined, url: string) => Response | Promise<Response>;

/** A fake server: "METHOD /path" → handler. Calls it does not know are listed in `unexpected`. */
export function stubApi(routes: Record<string, Handler>) {
  const calls: Array<{ method: string; url: string; init: RequestInit | undefined }> = [];
  const unexpected: string[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = typeof input === 'string' ? input : input instanceof URL ? input.pathname : input.url;
    const method = (init?.method ?? 'GET').toUpperCase();
    calls.push({ method, url, init });
    const handler = routes[`${method} ${url}`];
    if (!handler) {
      unexpected.push(`${method} ${url}`);
      return jsonResponse({ error: { code: 'NOT_STUBBED', message: `No stub for ${method} ${url}` } }, 500);
    }
    return handler(init, url);
  });
  vi.stubGlobal('fetch', fetchMock);
  return { calls, unexpected, fetchMock };
}

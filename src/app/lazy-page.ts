// Route-level code splitting: a page module loads when its route is first opened, so a phone
// on poor signal downloads the editors, charts and tables only when someone needs them.
import { createElement, lazy, useRef, type ComponentProps, type ComponentType, type FunctionComponent } from 'react';

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type LazyPage<C extends ComponentType<any>> = FunctionComponent<ComponentProps<C>> & {
  /** Starts loading the page's code now (the address that opens it was asked for). */
  preload: () => Promise<unknown>;
};

/**
 * A page whose code loads on first render, or earlier through `preload()`. A page whose code has
 * already arrived renders at once: React shows a suspended page's content no sooner than 300 ms
 * after its placeholder, a wait a page opened from a link or a reload has no need for.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export function lazyPage<K extends string, M extends Record<K, ComponentType<any>>>(load: () => Promise<M>, name: K): LazyPage<M[K]> {
  let loaded: M[K] | undefined;
  let loading: Promise<M> | undefined;
  const start = () => {
    loading ??= load().then(
      (m) => {
        loaded = m[name];
        return m;
      },
      (err: unknown) => {
        loading = undefined;
        throw err;
      },
    );
    return loading;
  };
  const Lazy = lazy(() => start().then((m) => ({ default: m[name] })));
  const Page = ((props: ComponentProps<M[K]>) => {
    // Chosen once per mounted page: switching from the lazy wrapper to the loaded component later
    // would remount the page and lose what was typed in it.
    const component = useRef(loaded ?? Lazy).current;
    return createElement(component, props);
  }) as LazyPage<M[K]>;
  Page.displayName = `LazyPage(${name})`;
  Page.preload = start;
  return Page;
}

// @vitest-environment jsdom
// "/" pressed before the header's search box has loaded: the box is asked for at once and gets
// what was typed after it; nothing is held once the box is there, after Escape, or for long.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { listenForEarlySearch, searchBoxArrived } from '@/lib/search-shortcut';

const press = (key: string, target: EventTarget = window) => {
  const e = new KeyboardEvent('keydown', { key, bubbles: true, cancelable: true });
  target.dispatchEvent(e);
  return e.defaultPrevented;
};

let stop: () => void;
let wanted: ReturnType<typeof vi.fn<() => void>>;
beforeEach(() => {
  wanted = vi.fn<() => void>();
  stop = listenForEarlySearch(wanted);
});
afterEach(() => {
  stop();
  searchBoxArrived().gone();
  vi.useRealTimers();
});

describe('the search shortcut before the box has loaded', () => {
  it('when "/" and then letters are pressed, then the box is asked for once and receives the letters', () => {
    expect(press('/')).toBe(true);
    for (const k of 'loupx') press(k);
    press('Backspace');
    press('e');
    expect(wanted).toHaveBeenCalledTimes(1);
    const { typed, gone } = searchBoxArrived();
    expect(typed).toBe('loupe');
    // The box handles keys itself from now on.
    expect(press('/')).toBe(false);
    gone();
  });

  it('when no "/" was pressed, then the box receives nothing and letters are left alone', () => {
    expect(press('a')).toBe(false);
    expect(wanted).not.toHaveBeenCalled();
    expect(searchBoxArrived().typed).toBeNull();
  });

  it('when "/" is typed into a field, then it is the field\'s', () => {
    const input = document.body.appendChild(document.createElement('input'));
    expect(press('/', input)).toBe(false);
    expect(wanted).not.toHaveBeenCalled();
    input.remove();
  });

  it('when Escape is pressed or the box takes too long, then later keys are no longer held', () => {
    press('/');
    press('a');
    expect(press('Escape')).toBe(false);
    expect(press('b')).toBe(false);
    expect(searchBoxArrived().typed).toBeNull();
    searchBoxArrived().gone();

    vi.useFakeTimers();
    press('/');
    press('c');
    vi.advanceTimersByTime(3500);
    expect(press('d')).toBe(false);
    expect(searchBoxArrived().typed).toBeNull();
  });
});

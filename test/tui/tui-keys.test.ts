// The key reducer: quit asks first only while journaling, notes are typed and sent, pause and restart, help.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { INITIAL_UI, MAX_NOTE_CHARS, reduceKey, type UiState } from '../../host/tui/keys.ts';

const plain = { writesJournal: false };
const journaling = { writesJournal: true };
const press = (s: UiState, input: string, ctx = plain, extra = {}) => reduceKey(s, { input, ...extra }, ctx);

describe('key reducer', () => {
  it('q quits at once without a journal, asks first with one', () => {
    expect(press(INITIAL_UI, 'q').effect).toEqual({ kind: 'quit' });
    const asked = press(INITIAL_UI, 'q', journaling);
    expect(asked.effect).toBeUndefined();
    expect(asked.state.mode.kind).toBe('confirm-quit');
    expect(press(asked.state, 'y', journaling).effect).toEqual({ kind: 'quit' });
    const stayed = press(asked.state, 'n', journaling);
    expect(stayed.effect).toBeUndefined();
    expect(stayed.state.mode.kind).toBe('main');
  });

  it('Ctrl+C quits from any mode', () => {
    for (const mode of [{ kind: 'main' }, { kind: 'help' }, { kind: 'note', text: 'x' }, { kind: 'confirm-quit' }] as const)
      expect(reduceKey({ ...INITIAL_UI, mode }, { input: 'c', ctrl: true }, journaling).effect).toEqual({ kind: 'quit' });
  });

  it('n opens a note, typing edits it, Enter sends it trimmed, Esc cancels', () => {
    let s = press(INITIAL_UI, 'n', journaling).state;
    expect(s.mode).toEqual({ kind: 'note', text: '' });
    for (const ch of ' re-released at 20°x') s = press(s, ch, journaling).state;
    s = press(s, '', journaling, { backspace: true }).state;
    const sent = press(s, '\r', journaling, { return: true });
    expect(sent.effect).toEqual({ kind: 'note', text: 're-released at 20°' });
    expect(sent.state.mode.kind).toBe('main');
    const cancelled = press(press(INITIAL_UI, 'n', journaling).state, '', journaling, { escape: true });
    expect(cancelled.effect).toBeUndefined();
    expect(cancelled.state.mode.kind).toBe('main');
  });

  it('keys typed into a note never trigger commands, and the note is capped', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 300 }), (text) => {
        let s = press(INITIAL_UI, 'n', journaling).state;
        for (const ch of text) {
          const r = press(s, ch, journaling);
          expect(r.effect).toBeUndefined();
          s = r.state;
        }
        expect(s.mode.kind).toBe('note');
        if (s.mode.kind === 'note') expect(s.mode.text.length).toBeLessThanOrEqual(MAX_NOTE_CHARS);
      }),
    );
  });

  it('n without a journal only says so', () => {
    const r = press(INITIAL_UI, 'n');
    expect(r.state.mode.kind).toBe('main');
    expect(r.state.flash).toMatch(/no journal/);
  });

  it('p toggles the pause, r asks for a restart, ? opens and any key closes help', () => {
    const paused = press(INITIAL_UI, 'p').state;
    expect(paused.paused).toBe(true);
    expect(press(paused, 'p').state.paused).toBe(false);
    expect(press(INITIAL_UI, 'r').effect).toEqual({ kind: 'restart' });
    const help = press(INITIAL_UI, '?').state;
    expect(help.mode.kind).toBe('help');
    expect(press(help, 'x').state.mode.kind).toBe('main');
  });
});

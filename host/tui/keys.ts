// The live view's key handling as a pure reducer: modes (main, help, note entry, quit confirmation) and the effects keys ask for.

/** What the view is showing over the main screen. */
export type UiMode = { readonly kind: 'main' } | { readonly kind: 'help' } | { readonly kind: 'note'; readonly text: string } | { readonly kind: 'confirm-quit' };

export interface UiState {
  readonly mode: UiMode;
  /** The display is frozen; recording and analysis go on. */
  readonly paused: boolean;
  /** A short message shown once in the footer (e.g. "note saved"). */
  readonly flash: string | null;
}

/** The subset of ink's key object the reducer reads. */
export interface KeyPress {
  readonly input: string;
  readonly ctrl?: boolean;
  readonly return?: boolean;
  readonly escape?: boolean;
  readonly backspace?: boolean;
  readonly delete?: boolean;
}

/** What the shell must do after a key. */
export type KeyEffect = { readonly kind: 'quit' } | { readonly kind: 'restart' } | { readonly kind: 'note'; readonly text: string };

export interface KeyContext {
  /** This process writes a journal, so quitting ends a recording and asks first. */
  readonly writesJournal: boolean;
}

export const INITIAL_UI: UiState = { mode: { kind: 'main' }, paused: false, flash: null };

/** Longest note accepted from the keyboard; a journal line should stay readable. */
export const MAX_NOTE_CHARS = 200;

/** Applies one key press. Ctrl+C always quits (the shutdown path flushes the journal first). */
export function reduceKey(state: UiState, key: KeyPress, ctx: KeyContext): { state: UiState; effect?: KeyEffect } {
  if (key.ctrl && key.input === 'c') return { state, effect: { kind: 'quit' } };
  const mode = state.mode;
  const main = (patch: Partial<UiState> = {}): UiState => ({ ...state, mode: { kind: 'main' }, flash: null, ...patch });
  switch (mode.kind) {
    case 'note': {
      if (key.escape) return { state: main({ flash: 'note cancelled' }) };
      if (key.return) {
        const text = mode.text.trim();
        return text ? { state: main({ flash: 'note added' }), effect: { kind: 'note', text } } : { state: main({ flash: 'empty note, nothing added' }) };
      }
      if (key.backspace || key.delete) return { state: { ...state, mode: { kind: 'note', text: mode.text.slice(0, -1) } } };
      if (key.ctrl || key.input === '') return { state };
      // Typed fast or pasted, text and Enter arrive as one chunk: the line ends at the first CR or LF.
      const end = key.input.search(/[\r\n]/);
      const printable = (end < 0 ? key.input : key.input.slice(0, end)).replace(/[\x00-\x1f\x7f]/g, '');
      const text = (mode.text + printable).slice(0, MAX_NOTE_CHARS);
      if (end >= 0) return reduceKey({ ...state, mode: { kind: 'note', text } }, { input: '\r', return: true }, ctx);
      return { state: { ...state, mode: { kind: 'note', text } } };
    }
    case 'confirm-quit':
      if (key.input === 'y' || key.input === 'Y') return { state, effect: { kind: 'quit' } };
      return { state: main({ flash: 'still recording' }) };
    case 'help':
      if (key.input === 'q' && !ctx.writesJournal) return { state, effect: { kind: 'quit' } };
      return { state: main() };
    case 'main':
      switch (key.input) {
        case 'q':
          return ctx.writesJournal ? { state: { ...state, mode: { kind: 'confirm-quit' }, flash: null } } : { state, effect: { kind: 'quit' } };
        case 'n':
          return ctx.writesJournal ? { state: { ...state, mode: { kind: 'note', text: '' }, flash: null } } : { state: main({ flash: 'no journal is being written here: nothing to note into' }) };
        case 'p':
          return { state: main({ paused: !state.paused, flash: state.paused ? 'display resumed' : 'display paused (recording goes on)' }) };
        case 'r':
          return { state: main({ flash: 'estimates restarted from now' }), effect: { kind: 'restart' } };
        case '?':
        case 'h':
          return { state: { ...state, mode: { kind: 'help' }, flash: null } };
        default:
          return { state };
      }
  }
}

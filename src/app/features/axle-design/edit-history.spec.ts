import { EditHistory } from './edit-history';

describe('EditHistory', () => {
  it('undoes and redoes committed values in order', () => {
    const h = new EditHistory<string>('a');
    expect(h.canUndo()).toBe(false);
    h.commit('b');
    h.commit('c');
    expect(h.present()).toBe('c');
    h.undo();
    expect(h.present()).toBe('b');
    h.undo();
    expect(h.present()).toBe('a');
    expect(h.canUndo()).toBe(false);
    expect(h.canRedo()).toBe(true);
    h.redo();
    h.redo();
    expect(h.present()).toBe('c');
    expect(h.canRedo()).toBe(false);
  });

  it('drops the redo steps when a new value is committed after an undo', () => {
    const h = new EditHistory<number>(0);
    h.commit(1);
    h.commit(2);
    h.undo();
    h.commit(5);
    expect(h.canRedo()).toBe(false);
    h.undo();
    expect(h.present()).toBe(1);
  });

  it('ignores a commit of the value already shown (no empty undo step)', () => {
    const value = { x: 1 };
    const h = new EditHistory(value);
    h.commit(value);
    expect(h.canUndo()).toBe(false);
  });

  it('keeps at most `limit` undo steps, dropping the oldest', () => {
    const h = new EditHistory<number>(0, 3);
    for (let i = 1; i <= 5; i++) h.commit(i);
    h.undo();
    h.undo();
    h.undo();
    expect(h.present()).toBe(2);
    expect(h.canUndo()).toBe(false);
  });

  it('starts over from a value with no undo or redo steps on reset', () => {
    const h = new EditHistory<string>('a');
    h.commit('b');
    h.commit('c');
    h.undo();
    h.reset('z');
    expect(h.present()).toBe('z');
    expect(h.canUndo()).toBe(false);
    expect(h.canRedo()).toBe(false);
  });

  it('does nothing on undo or redo with empty stacks', () => {
    const h = new EditHistory<string>('a');
    h.undo();
    h.redo();
    expect(h.present()).toBe('a');
  });
});

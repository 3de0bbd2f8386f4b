import { TestBed } from '@angular/core/testing';
import { SectionNav } from './section-nav';

describe('SectionNav', () => {
  it('lists the sections and, when one is chosen, opens it if folded and moves the focus to its heading', () => {
    const page = document.createElement('div');
    page.innerHTML = `
      <h2 id="s-results">Results</h2>
      <details id="fold"><summary><h2 id="s-history">History</h2></summary><p>Steps</p></details>`;
    document.body.append(page);
    const fixture = TestBed.createComponent(SectionNav);
    fixture.componentRef.setInput('sections', [
      { id: 's-results', label: 'Results' },
      { id: 's-history', label: 'History' },
    ]);
    fixture.detectChanges();
    const root = fixture.nativeElement as HTMLElement;
    expect(root.querySelector('nav')!.getAttribute('aria-label')).toBe('On this page');
    const buttons = [...root.querySelectorAll('button')];
    expect(buttons.map((b) => b.textContent.trim())).toEqual(['Results', 'History']);

    const fold = document.getElementById('fold') as HTMLDetailsElement;
    expect(fold.open).toBe(false);
    buttons[1]!.click();
    expect(fold.open).toBe(true);
    expect(document.activeElement).toBe(document.getElementById('s-history'));
    buttons[0]!.click();
    expect(document.activeElement).toBe(document.getElementById('s-results'));
    page.remove();
  });
});

import { splitMailLinks } from './mail-links';

describe('splitMailLinks', () => {
  it('cuts a mail body into text and links, keeping every character', () => {
    const body = 'To choose a new one, open:\nhttp://127.0.0.1:4200/reset-password/AbC_d-9\n\nThe link works once.';
    const segments = splitMailLinks(body);
    expect(segments).toEqual([
      { text: 'To choose a new one, open:\n' },
      { text: 'http://127.0.0.1:4200/reset-password/AbC_d-9', href: 'http://127.0.0.1:4200/reset-password/AbC_d-9' },
      { text: '\n\nThe link works once.' },
    ]);
    expect(segments.map((s) => s.text).join('')).toBe(body);
  });

  it('leaves sentence punctuation after an address out of the link', () => {
    expect(splitMailLinks('Open https://rollwise.example/invitations/x.y.')).toEqual([
      { text: 'Open ' },
      { text: 'https://rollwise.example/invitations/x.y', href: 'https://rollwise.example/invitations/x.y' },
      { text: '.' },
    ]);
  });

  it('makes links only of http(s) addresses', () => {
    expect(splitMailLinks('javascript:alert(1) and mailto:ana@tallowmere.example')).toEqual([
      { text: 'javascript:alert(1) and mailto:ana@tallowmere.example' },
    ]);
    expect(splitMailLinks('')).toEqual([]);
  });
});

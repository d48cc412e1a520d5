import { linkify } from './linkify';

describe('linkify', () => {
  it('splits text around http and https links', () => {
    expect(linkify('Open https://trayplan.example/reset/abc to continue.')).toEqual([
      { kind: 'text', text: 'Open ' },
      {
        kind: 'link',
        text: 'https://trayplan.example/reset/abc',
        href: 'https://trayplan.example/reset/abc',
      },
      { kind: 'text', text: ' to continue.' },
    ]);
  });

  it('leaves sentence punctuation after a link out of the link', () => {
    const parts = linkify('See http://127.0.0.1:4200/invitation/x1y2z3.');
    expect(parts[1]).toEqual({
      kind: 'link',
      text: 'http://127.0.0.1:4200/invitation/x1y2z3',
      href: 'http://127.0.0.1:4200/invitation/x1y2z3',
    });
    expect(parts[2]).toEqual({ kind: 'text', text: '.' });
  });

  it('never turns other schemes into links', () => {
    const parts = linkify('javascript:alert(1) and mailto:office@school.example');
    expect(parts.every((part) => part.kind === 'text')).toBeTrue();
  });

  it('keeps text without links whole, and an empty text empty', () => {
    expect(linkify('No links here.\nSecond line.')).toEqual([
      { kind: 'text', text: 'No links here.\nSecond line.' },
    ]);
    expect(linkify('')).toEqual([]);
  });
});

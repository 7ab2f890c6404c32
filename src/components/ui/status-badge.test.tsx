import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import '@/test/render';
import { i18n } from '@/lib/i18n';
import { StatusBadge, unitStatuses } from './status-badge';

const expected = {
  clear: { glyph: '●', word: 'Clear', colour: 'bg-clear-soft' },
  watch: { glyph: '▲', word: 'Watch', colour: 'bg-watch-soft' },
  act: { glyph: '◆', word: 'Act', colour: 'bg-act' },
  silent: { glyph: '○', word: 'Silent', colour: 'bg-silent-soft' },
} as const;

describe('StatusBadge', () => {
  for (const status of unitStatuses) {
    it(`shows the colour, the ${expected[status].glyph} glyph and the word for "${status}"`, () => {
      render(<StatusBadge status={status} />);
      const badge = screen.getByRole('img', { name: `Status: ${expected[status].word}` });
      expect(badge.className).toContain(`status-${status}`);
      expect(badge.className.split(' ')).toContain(expected[status].colour);
      expect(badge.textContent).toBe(`${expected[status].glyph}${expected[status].word}`);
      expect(badge.getAttribute('data-status')).toBe(status);
    });
  }

  it('gives every status its own glyph and colour', () => {
    const { container } = render(
      <>
        {unitStatuses.map((s) => (
          <StatusBadge key={s} status={s} />
        ))}
      </>,
    );
    const badges = [...container.querySelectorAll('[data-status]')];
    expect(new Set(badges.map((b) => b.textContent?.[0])).size).toBe(4);
    expect(new Set(badges.map((b) => b.className)).size).toBe(4);
  });

  it('says the word in Spanish when the language is Spanish', async () => {
    await i18n.changeLanguage('es');
    render(<StatusBadge status="watch" />);
    expect(screen.getByRole('img', { name: 'Estado: Vigilar' }).textContent).toBe('▲Vigilar');
  });
});

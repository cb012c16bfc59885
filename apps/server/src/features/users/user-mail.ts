import { esc, htmlLayout, type Rendered } from '../mail/mail-templates.ts';
import { TOKEN_HOURS } from './user-tokens-repository.ts';

export function renderInvite(name: string, inviter: string, link: string): Rendered {
  const text = [
    `Hello ${name},`,
    '',
    `${inviter} invited you to Turnstone, the vibration condition monitoring system.`,
    `Choose your password here (the link works once, for ${TOKEN_HOURS.invite} hours):`,
    link,
    '',
    'If you did not expect this, ignore the message; nothing happens without the link.',
    '',
  ].join('\n');
  const html = htmlLayout(
    'You are invited to Turnstone',
    `<p>Hello ${esc(name)},</p><p>${esc(inviter)} invited you to Turnstone, the vibration condition monitoring system.</p>` +
      `<p><a href="${esc(link)}" style="color:#1d5c63">Choose your password</a> (the link works once, for ${TOKEN_HOURS.invite} hours).</p>` +
      `<p style="font-family:monospace;font-size:12px;word-break:break-all">${esc(link)}</p>`,
    'If you did not expect this, ignore the message; nothing happens without the link.',
  );
  return { subject: 'You are invited to Turnstone', text, html };
}

export function renderReset(name: string, link: string): Rendered {
  const text = [
    `Hello ${name},`,
    '',
    'Someone asked to reset your Turnstone password. Choose a new one here',
    `(the link works once, for ${TOKEN_HOURS.reset} hour):`,
    link,
    '',
    'If it was not you, ignore this message: your password stays as it is.',
    '',
  ].join('\n');
  const html = htmlLayout(
    'Reset your Turnstone password',
    `<p>Hello ${esc(name)},</p><p>Someone asked to reset your Turnstone password.</p>` +
      `<p><a href="${esc(link)}" style="color:#1d5c63">Choose a new password</a> (the link works once, for ${TOKEN_HOURS.reset} hour).</p>` +
      `<p style="font-family:monospace;font-size:12px;word-break:break-all">${esc(link)}</p>`,
    'If it was not you, ignore this message: your password stays as it is.',
  );
  return { subject: 'Reset your Turnstone password', text, html };
}

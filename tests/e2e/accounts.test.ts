import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op } from 'sequelize';
import type { Browser, Page } from 'playwright-core';
import { startTestServer, type TestServer } from '../support/server';
import { launchBrowser, screenshot, signInThroughPage, VIEWPORTS } from '../support/browser';
import { TestClient } from '../support/client';
import { createUser, TEST_PASSWORD, unique } from '../support/factories';
import { User } from '../../server/modules/users/user.model';
import { Throttle } from '../../server/lib/throttle.model';
import { hashPassword } from '../../server/modules/users/password';
import type { Role } from '../../shared/roles';

let server: TestServer;
let browser: Browser;

// Every row this file makes carries the tag in its e-mail address, so searching for the tag
// shows this run's people only, however many earlier runs left in the kept test database.
const tag = unique('acct');
const emailFor = (local: string) => `${local}.${tag}@test.faultline.test`;

let admin: User;

// Invented people for a realistic list; none of them is a real person.
const SHOWCASE: {
  local: string;
  name: string;
  role: Role;
  onCall?: boolean;
  active?: boolean;
  invited?: boolean;
  signedInHoursAgo?: number;
}[] = [
  { local: 'ines', name: 'Ines Varga-Holt', role: 'technician', onCall: true, signedInHoursAgo: 3 },
  { local: 'tomas', name: 'Tomas Quillfeather', role: 'member', signedInHoursAgo: 50 },
  { local: 'priya', name: 'Priya Okonkwo-Lind', role: 'manager', signedInHoursAgo: 26 },
  { local: 'jules', name: 'Jules Marrow', role: 'member', invited: true },
  { local: 'ren', name: 'Ren Aldous', role: 'member', active: false, signedInHoursAgo: 900 },
];

beforeAll(async () => {
  server = await startTestServer({}, { serveClient: true });
  browser = await launchBrowser();
  const passwordHash = await hashPassword(TEST_PASSWORD);
  admin = await User.create({
    email: emailFor('admin'),
    name: 'Dana Achterberg',
    role: 'admin',
    passwordHash,
    lastSignInAt: null,
    onCall: false,
    active: true,
  });
  for (const person of SHOWCASE) {
    await User.create({
      email: emailFor(person.local),
      name: person.name,
      role: person.role,
      passwordHash: person.invited ? null : passwordHash,
      lastSignInAt: person.signedInHoursAgo ? new Date(Date.now() - person.signedInHoursAgo * 3600_000) : null,
      onCall: person.onCall ?? false,
      active: person.active ?? true,
    });
  }
  // The reset-request limit counts per address in the database, which outlives a run; earlier
  // runs' requests from this same address must not use up this run's allowance.
  await Throttle.destroy({ where: { key: { [Op.like]: 'rl:password-reset:%' } } });
});

afterAll(async () => {
  await browser?.close();
  await server?.close();
});

/** The path of the link in a caught mail (the mail names the configured public address, not the test port). */
function linkPath(text: string): string {
  const match = /\/reset-password\/[A-Za-z0-9_-]{43}/.exec(text);
  if (!match) throw new Error(`no password link in mail:\n${text}`);
  return match[0];
}

async function openUsersPage(page: Page) {
  await page.goto(`${server.url}/admin`);
  await page.getByRole('heading', { name: 'Admin', level: 1 }).waitFor();
  await screenshot(page, 'admin-hub-desktop');
  await page.getByRole('link', { name: /Open users/ }).click();
  await page.getByRole('heading', { name: 'Users', level: 1 }).waitFor();
  await page.getByRole('searchbox', { name: /Search/ }).fill(tag);
  await page.waitForURL((url) => url.searchParams.get('q') === tag);
  // The unfiltered rows stay in view until the search's answer replaces them.
  await expect.poll(() => page.getByTestId('user-row').count()).toBe(SHOWCASE.length + 1);
}

const row = (page: Page, email: string) => page.locator(`[data-testid="user-row"][data-user-email="${email}"]`);

describe('inviting, editing and disabling people', () => {
  it('when an admin invites a person through the page, then the mailed link sets their password, they can sign in, and disabling them ends their access', async () => {
    const adminContext = await browser.newContext({ viewport: VIEWPORTS.desktop });
    const adminPage = await adminContext.newPage();
    await signInThroughPage(adminPage, server.url, admin.email, TEST_PASSWORD);
    await adminPage.getByTestId('home-admin').waitFor();
    await openUsersPage(adminPage);

    // The search found this run's six people, the admin marked as themself.
    await expect.poll(() => row(adminPage, emailFor('admin')).innerText()).toContain('(you)');
    expect(await row(adminPage, emailFor('jules')).innerText()).toContain('Invited');
    expect(await row(adminPage, emailFor('ren')).innerText()).toContain('Disabled');
    expect(await row(adminPage, emailFor('ines')).innerText()).toContain('Active');

    // Filtering by role narrows the list to the one manager.
    await adminPage.getByRole('combobox', { name: /^Role/ }).selectOption('manager');
    await expect.poll(() => adminPage.getByTestId('user-row').count()).toBe(1);
    expect(await row(adminPage, emailFor('priya')).count()).toBe(1);
    await adminPage.getByRole('combobox', { name: /^Role/ }).selectOption('');
    await expect.poll(() => adminPage.getByTestId('user-row').count()).toBe(SHOWCASE.length + 1);

    // Invite a technician who is on call.
    const newEmail = emailFor('sami');
    await adminPage.getByRole('button', { name: 'Invite a person' }).click();
    const form = adminPage.getByRole('form', { name: 'Invite a person' });
    await form.getByLabel(/^Name/).fill('Sami Ferreira-Quint');
    await form.getByLabel(/^E-mail address/).fill(newEmail);
    await form.getByLabel(/^Role/).selectOption('technician');
    await form.getByLabel('On call').check();
    await screenshot(adminPage, 'admin-users-invite-desktop');
    await form.getByRole('button', { name: 'Send the invitation' }).click();
    await adminPage
      .getByRole('alert')
      .filter({ hasText: `Invitation sent to ${newEmail}` })
      .waitFor();
    await expect.poll(() => row(adminPage, newEmail).count()).toBe(1);
    const invitedRow = await row(adminPage, newEmail).innerText();
    expect(invitedRow).toContain('Invited');
    expect(invitedRow).toContain('Technician');
    expect(invitedRow).toContain('On call');
    const invitee = await User.findOne({ where: { email: newEmail } });
    expect(invitee).toMatchObject({ role: 'technician', onCall: true, active: true, passwordHash: null });

    // Inviting the same address again is refused with the field marked.
    await adminPage.getByRole('button', { name: 'Invite a person' }).click();
    await form.getByLabel(/^Name/).fill('Sami again');
    await form.getByLabel(/^E-mail address/).fill(newEmail);
    await form.getByRole('button', { name: 'Send the invitation' }).click();
    await form.getByText('This address already has an account.').waitFor();
    await form.getByRole('button', { name: 'Cancel' }).click();

    // Change another person's role and on-call duty through the row editor.
    await row(adminPage, emailFor('ines')).getByRole('button', { name: /^Edit/ }).click();
    const inesEditor = adminPage.getByTestId(`user-editor-${(await User.findOne({ where: { email: emailFor('ines') } }))!.id}`);
    await inesEditor.getByLabel(/^Role/).selectOption('manager');
    await inesEditor.getByLabel('On call').uncheck();
    await inesEditor.getByRole('button', { name: 'Save changes' }).click();
    await adminPage.getByRole('alert').filter({ hasText: 'Changes to Ines Varga-Holt saved' }).waitFor();
    await expect.poll(async () => (await User.findOne({ where: { email: emailFor('ines') } }))?.role).toBe('manager');
    expect((await User.findOne({ where: { email: emailFor('ines') } }))?.onCall).toBe(false);
    await expect.poll(() => row(adminPage, emailFor('ines')).innerText()).toContain('Manager');

    // The admin's own row cannot take away their role or access.
    await row(adminPage, emailFor('admin')).getByRole('button', { name: /^Edit/ }).click();
    const ownEditor = adminPage.getByTestId(`user-editor-${admin.id}`);
    expect(await ownEditor.getByLabel(/^Role/).isDisabled()).toBe(true);
    expect(await ownEditor.getByRole('button', { name: /Disable account/ }).count()).toBe(0);
    await ownEditor.getByRole('button', { name: 'Close' }).click();

    await screenshot(adminPage, 'admin-users-desktop');

    // The invitation arrives at the mail catcher.
    await server.worker.runOnce();
    const mail = await server.catcher.waitFor((m) => m.to.includes(newEmail) && /invited/i.test(m.subject));
    const path = linkPath(mail.text);

    // The invitee opens the link on their phone, in a browser that knows nothing of the admin.
    const inviteeContext = await browser.newContext({ viewport: VIEWPORTS.phone });
    const inviteePage = await inviteeContext.newPage();
    await inviteePage.goto(server.url + path);
    await inviteePage.getByRole('heading', { name: 'Choose your password' }).waitFor();
    await screenshot(inviteePage, 'reset-password-phone');

    // Too short: refused in the page, before any request.
    await inviteePage.getByLabel(/^New password/).fill('short');
    await inviteePage.getByLabel(/^Repeat the password/).fill('short');
    await inviteePage.getByRole('button', { name: 'Save the password' }).click();
    await inviteePage.getByText(/Use at least 8 characters/).waitFor();

    // The two entries differ.
    await inviteePage.getByLabel(/^New password/).fill('wafer-boat-quartz-91');
    await inviteePage.getByLabel(/^Repeat the password/).fill('wafer-boat-quartz-19');
    await inviteePage.getByRole('button', { name: 'Save the password' }).click();
    await inviteePage.getByText('The two entries differ. Type the same password twice.').waitFor();

    // A common password passes the length check here but the server refuses it, and says why.
    await inviteePage.getByLabel(/^New password/).fill('password123');
    await inviteePage.getByLabel(/^Repeat the password/).fill('password123');
    await inviteePage.getByRole('button', { name: 'Save the password' }).click();
    await inviteePage.getByText(/commonly used passwords/).waitFor();
    expect((await User.findByPk(invitee!.id))!.passwordHash).toBeNull();
    await screenshot(inviteePage, 'reset-password-error-phone');

    const chosen = 'wafer-boat-quartz-91';
    await inviteePage.getByLabel(/^New password/).fill(chosen);
    await inviteePage.getByLabel(/^Repeat the password/).fill(chosen);
    await inviteePage.getByRole('button', { name: 'Save the password' }).click();
    await inviteePage.getByRole('alert').filter({ hasText: 'Your password is set' }).waitFor();
    await inviteePage.getByRole('link', { name: 'Go to sign in' }).click();
    await inviteePage.waitForURL(/\/sign-in/);

    await signInThroughPage(inviteePage, server.url, newEmail, chosen);
    await inviteePage.getByTestId('home-technician').waitFor();
    expect((await inviteePage.request.get(`${server.url}/api/notices`)).status()).toBe(200);

    // The admin sees them active now, then disables them with a confirm step.
    await adminPage.reload();
    await expect.poll(() => row(adminPage, newEmail).innerText()).toContain('Active');
    await row(adminPage, newEmail).getByRole('button', { name: /^Edit/ }).click();
    await adminPage.getByRole('button', { name: 'Disable account…' }).click();
    const confirm = adminPage.getByText('Disable Sami Ferreira-Quint?');
    await confirm.waitFor();
    // Nothing happens before the confirmation.
    expect((await User.findByPk(invitee!.id))!.active).toBe(true);
    await screenshot(adminPage, 'admin-users-confirm-desktop');
    await adminPage.getByRole('button', { name: 'Yes, disable the account' }).click();
    await adminPage.getByRole('alert').filter({ hasText: 'Sami Ferreira-Quint is disabled' }).waitFor();
    await expect.poll(() => row(adminPage, newEmail).innerText()).toContain('Disabled');
    expect((await User.findByPk(invitee!.id))!.active).toBe(false);

    // Their next API call fails, and their open page goes back to sign-in.
    expect((await inviteePage.request.get(`${server.url}/api/notices`)).status()).toBe(401);
    await inviteePage.waitForURL(/\/sign-in/, { timeout: 15_000 });

    // The phone view of the list.
    const phoneContext = await browser.newContext({ viewport: VIEWPORTS.phone });
    const phonePage = await phoneContext.newPage();
    await signInThroughPage(phonePage, server.url, admin.email, TEST_PASSWORD);
    await phonePage.getByTestId('home-admin').waitFor();
    await phonePage.goto(`${server.url}/admin/users?q=${encodeURIComponent(tag)}`);
    await row(phonePage, newEmail).waitFor();
    await screenshot(phonePage, 'admin-users-phone');

    await phoneContext.close();
    await inviteeContext.close();
    await adminContext.close();
  });

  it('when a member opens the users page, then it is not shown to them', async () => {
    const member = await createUser('member');
    const context = await browser.newContext({ viewport: VIEWPORTS.phone });
    const page = await context.newPage();
    await signInThroughPage(page, server.url, member.email, TEST_PASSWORD);
    await page.getByTestId('home-member').waitFor();
    await page.goto(`${server.url}/admin/users`);
    await page.getByRole('heading', { name: 'This page is not for your account' }).waitFor();
    expect(await page.getByTestId('user-row').count()).toBe(0);
    await context.close();
  });
});

describe('forgot password', () => {
  it('when a person asks for a reset link from the sign-in page, then the mailed link sets a new password they can sign in with, once', async () => {
    const person = await User.create({
      email: emailFor('forgetful'),
      name: 'Noor Halvorsen',
      role: 'member',
      passwordHash: await hashPassword(TEST_PASSWORD),
      lastSignInAt: null,
      onCall: false,
      active: true,
    });

    const context = await browser.newContext({ viewport: VIEWPORTS.phone });
    const page = await context.newPage();
    await page.goto(`${server.url}/sign-in`);
    await page.getByRole('link', { name: 'Forgot your password?' }).click();
    await page.waitForURL(/\/forgot-password$/);
    await page.getByRole('heading', { name: 'Forgot your password?' }).waitFor();

    // A malformed address is caught in the page.
    await page.getByLabel(/^E-mail address/).fill('not-an-address');
    await page.getByRole('button', { name: 'Send the link' }).click();
    await page.getByText('Enter a valid e-mail address.').waitFor();
    await screenshot(page, 'forgot-password-phone');

    await page.getByLabel(/^E-mail address/).fill(person.email);
    await page.getByRole('button', { name: 'Send the link' }).click();
    await page.getByRole('alert').filter({ hasText: 'Check your e-mail' }).waitFor();
    expect(await page.getByRole('alert').innerText()).toContain(person.email);
    await screenshot(page, 'forgot-password-sent-phone');

    await server.worker.runOnce();
    const mail = await server.catcher.waitFor((m) => m.to.includes(person.email) && /reset your password/i.test(m.subject));
    const path = linkPath(mail.text);

    const newPassword = 'etch-rate-drift-4711';
    await page.goto(server.url + path);
    await page.getByLabel(/^New password/).fill(newPassword);
    await page.getByLabel(/^Repeat the password/).fill(newPassword);
    await page.getByRole('button', { name: 'Save the password' }).click();
    await page.getByRole('alert').filter({ hasText: 'Your password is set' }).waitFor();

    // The old password is gone, the new one works.
    expect((await new TestClient(server.url).signIn(person.email, TEST_PASSWORD)).status).toBe(401);
    await signInThroughPage(page, server.url, person.email, newPassword);
    await page.getByTestId('home-member').waitFor();

    // The same link a second time: the page says it no longer works and offers a new one.
    const second = await browser.newContext({ viewport: VIEWPORTS.phone });
    const again = await second.newPage();
    await again.goto(server.url + path);
    await again.getByLabel(/^New password/).fill('another-long-phrase-22');
    await again.getByLabel(/^Repeat the password/).fill('another-long-phrase-22');
    await again.getByRole('button', { name: 'Save the password' }).click();
    await again.getByText('This link no longer works').waitFor();
    expect(await again.getByRole('link', { name: 'Get a new link' }).getAttribute('href')).toBe('/forgot-password');

    // A link mangled on the way says so at once.
    await again.goto(`${server.url}/reset-password/too-short`);
    await again.getByText('This link no longer works').waitFor();

    await second.close();
    await context.close();
  });
});

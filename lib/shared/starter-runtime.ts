/**
 * The script of the ready-to-host starter experiment: plain browser JavaScript, no library, run
 * from a static page on the lab's own site against the session API with a browser key. It is
 * embedded into the downloaded HTML as `(starterRuntime)(config)` (Function.prototype.toString),
 * so it must stay self-contained: no imports, no references outside its own body.
 *
 * The session: calibration block (GET …/calibration, which starts the session and hands out the
 * session token), calibration answers → stage-2 items (POST …/probe-items), then the stage-2
 * block on the same screen with no visible break, each answer sent as it is given (POST
 * …/stage2-answers). Everything is kept in localStorage per participant, so a reload or a lost
 * connection resumes where the participant was; a button takes one click per item; failed calls
 * are retried (429 after Retry-After).
 */
/** Where the key goes in a downloaded starter: the operator's browser puts the new key's secret there, or the lab edits it in. */
export const BROWSER_KEY_PLACEHOLDER = 'PASTE-YOUR-BROWSER-KEY-HERE';

export type StarterConfig = {
  apiBase: string;
  studyId: number;
  designVersionId: number;
  browserKey: string;
  /** 'bank': the exported order; 'participant': shuffled per participant (seeded on the server) */
  calibrationOrder: 'bank' | 'participant';
  title: string;
  instructions: string;
  thanks: string;
};

type StarterItem = { id: string; soonerAmount: number; soonerDelay: number; laterAmount: number; laterDelay: number; soonerSide: 'left' | 'right'; text: string };

export function starterRuntime(config: StarterConfig, options?: { helpersOnly?: boolean }) {
  // Wording as Switchback's item bank words it: "today", "in 3 weeks", a month is 30 days.
  function delayText(days: number, unit: string): string {
    if (days === 0) return 'today';
    const u = unit === 'weeks' ? 7 : unit === 'months' ? 30 : 1;
    if (u > 1 && days % u === 0) {
      const n = days / u;
      return 'in ' + n + ' ' + (unit === 'weeks' ? 'week' : 'month') + (n === 1 ? '' : 's');
    }
    return 'in ' + days + ' day' + (days === 1 ? '' : 's');
  }
  function amountText(amount: number, currency: string): string {
    const whole = Number.isInteger(amount);
    try {
      const format = new Intl.NumberFormat('en', whole ? { style: 'currency', currency, minimumFractionDigits: 0, maximumFractionDigits: 0 } : { style: 'currency', currency });
      return format.format(amount);
    } catch {
      return amount + ' ' + currency;
    }
  }
  if (options && options.helpersOnly) return { delayText, amountText };

  const root = document.getElementById('switchback-root') as HTMLElement;
  const params = new URLSearchParams(window.location.search);
  let participantId = params.get('participantId');
  if (!participantId) {
    participantId = window.localStorage.getItem('switchback:anonymous-id');
    if (!participantId) {
      const bytes = new Uint8Array(9);
      window.crypto.getRandomValues(bytes);
      participantId = 'anon-' + Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
      window.localStorage.setItem('switchback:anonymous-id', participantId);
    }
  }
  const pid = participantId;
  const storeKey = 'switchback:' + config.studyId + ':' + config.designVersionId + ':' + pid;
  type Answer = { chosen: 'sooner' | 'later'; responseTimeMs: number; sideShown: 'left' | 'right'; sent: boolean };
  type State = { token: string | null; itemBankId: string | null; currency: string; delayUnit: string; calibration: StarterItem[] | null; responses: Record<string, string>; stage2: StarterItem[] | null; answers: Record<string, Answer>; done: boolean };
  const saved = window.localStorage.getItem(storeKey);
  const state: State = saved ? JSON.parse(saved) : { token: null, itemBankId: null, currency: 'EUR', delayUnit: 'days', calibration: null, responses: {}, stage2: null, answers: {}, done: false };
  const save = () => window.localStorage.setItem(storeKey, JSON.stringify(state));

  function screen(html: string) {
    root.innerHTML = html;
    const focus = root.querySelector('[data-autofocus]') as HTMLElement | null;
    if (focus) focus.focus();
  }
  function escape(text: string): string {
    return String(text).replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);
  }
  const wait = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

  async function api(method: string, path: string, body?: unknown): Promise<{ status: number; body: Record<string, unknown> }> {
    for (let attempt = 0; ; attempt++) {
      try {
        const headers: Record<string, string> = { Authorization: 'Bearer ' + config.browserKey };
        if (body !== undefined) headers['Content-Type'] = 'application/json';
        if (state.token) headers['X-Session-Token'] = state.token;
        const response = await fetch(config.apiBase + '/api/v1/studies/' + config.studyId + path, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
        const text = await response.text();
        const json = text ? JSON.parse(text) : {};
        if ((response.status === 429 || response.status === 503) && attempt < 8) {
          await wait(1000 * Number(response.headers.get('Retry-After') || '1'));
          continue;
        }
        return { status: response.status, body: json };
      } catch {
        // a lost connection: keep trying, the participant's answers are safe in this browser
        screenNotice('Connection lost. Retrying…');
        await wait(Math.min(10_000, 500 * 2 ** Math.min(attempt, 5)));
      }
    }
  }
  function screenNotice(text: string) {
    const notice = document.getElementById('switchback-notice');
    if (notice) notice.textContent = text;
  }
  function fail(reply: { status: number; body: Record<string, unknown> }) {
    screen('<h1>' + escape(config.title) + '</h1><p role="alert">This session cannot continue (' + reply.status + '): ' + escape(String(reply.body.error || 'unknown error')) + '</p>');
    throw new Error('session stopped: ' + reply.status);
  }

  function choose(item: StarterItem, progress: string): Promise<Answer> {
    // in the units and currency of the key's item bank, as the calibration reply states them
    const sooner = amountText(item.soonerAmount, state.currency) + ' ' + delayText(item.soonerDelay, state.delayUnit);
    const later = amountText(item.laterAmount, state.currency) + ' ' + delayText(item.laterDelay, state.delayUnit);
    const left = item.soonerSide === 'left' ? ['sooner', sooner] : ['later', later];
    const right = item.soonerSide === 'left' ? ['later', later] : ['sooner', sooner];
    screen(
      '<p class="progress" aria-live="polite">' + escape(progress) + '</p>' +
        '<h1 class="question">Which would you take?</h1>' +
        '<div class="options">' +
        '<button type="button" data-choice="' + left[0] + '" data-autofocus>' + escape(left[1]) + '</button>' +
        '<button type="button" data-choice="' + right[0] + '">' + escape(right[1]) + '</button>' +
        '</div><p id="switchback-notice" class="notice" role="status"></p>',
    );
    const shownAt = performance.now();
    return new Promise((resolve) => {
      let taken = false;
      root.querySelectorAll('button[data-choice]').forEach((button) => {
        button.addEventListener('click', () => {
          if (taken) return; // a double click records one answer
          taken = true;
          root.querySelectorAll('button').forEach((b) => ((b as HTMLButtonElement).disabled = true));
          resolve({ chosen: (button as HTMLElement).dataset.choice as 'sooner' | 'later', responseTimeMs: Math.round(performance.now() - shownAt), sideShown: item.soonerSide, sent: false });
        });
      });
    });
  }

  async function sendAnswers() {
    const pending = Object.keys(state.answers).filter((id) => !state.answers[id].sent);
    if (pending.length === 0) return;
    const reply = await api('POST', '/stage2-answers', {
      participantId: pid,
      answers: pending.map((id) => ({ itemId: id, chosen: state.answers[id].chosen, responseTimeMs: state.answers[id].responseTimeMs, sideShown: state.answers[id].sideShown })),
    });
    if (reply.status !== 200) fail(reply);
    for (const id of pending) state.answers[id].sent = true;
    save();
  }

  async function run() {
    if (state.done) {
      screen('<h1>' + escape(config.title) + '</h1><p data-testid="done">' + escape(config.thanks) + '</p>');
      return;
    }
    if (!state.calibration) {
      screen('<h1>' + escape(config.title) + '</h1><p>' + escape(config.instructions) + '</p><button type="button" id="start" data-autofocus>Start</button>');
      await new Promise((resolve) => (root.querySelector('#start') as HTMLElement).addEventListener('click', resolve, { once: true }));
      const reply = await api('GET', '/calibration?participantId=' + encodeURIComponent(pid) + '&order=' + config.calibrationOrder);
      if (reply.status !== 200) fail(reply);
      if (typeof reply.body.sessionToken === 'string') state.token = reply.body.sessionToken;
      state.calibration = reply.body.items as StarterItem[];
      state.itemBankId = reply.body.itemBankId as string;
      const presentation = reply.body.presentation as { currency: string; delayUnit: string };
      state.currency = presentation.currency;
      state.delayUnit = presentation.delayUnit;
      save();
    }
    const calibration = state.calibration as StarterItem[];
    // one count over both blocks: the participant sees one run of choices, no break between stages
    let total = calibration.length + (state.stage2 ? state.stage2.length : 8);
    let index = Object.keys(state.responses).length + Object.keys(state.answers).length;
    for (const item of calibration) {
      if (state.responses[item.id]) continue;
      const answer = await choose(item, 'Choice ' + (index + 1) + ' of about ' + total);
      state.responses[item.id] = answer.chosen;
      save();
      index++;
    }
    if (!state.stage2) {
      screen('<p class="progress">Choice ' + (index + 1) + '</p><p id="switchback-notice" class="notice" role="status"></p>');
      const reply = await api('POST', '/probe-items', { participantId: pid, responses: state.responses, itemBankId: state.itemBankId });
      if (reply.status !== 200) fail(reply);
      state.stage2 = reply.body.items as StarterItem[];
      save();
    }
    const stage2 = state.stage2 as StarterItem[];
    total = calibration.length + stage2.length;
    await sendAnswers(); // answers given before a reload that did not reach the server yet
    for (const item of stage2) {
      if (state.answers[item.id]) continue;
      state.answers[item.id] = await choose(item, 'Choice ' + (index + 1) + ' of ' + total);
      save();
      index++;
      await sendAnswers();
    }
    state.done = true;
    save();
    screen('<h1>' + escape(config.title) + '</h1><p data-testid="done">' + escape(config.thanks) + '</p>');
  }

  run().catch(() => {});
  return null;
}

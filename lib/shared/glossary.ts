/**
 * The words and formulas Switchback uses, one entry each: a one-line explanation shown where the
 * term appears (TermHelp) and a fuller entry with the formula and its published source on the
 * methods and glossary page. Formulas use the planner's conventions: the large amount L is
 * normalised to 1, S = x·L, rates k (small reward) and K (large reward) per day, delays in days.
 */
export type GlossaryEntry = {
  /** anchor on the glossary page (/glossary#id) */
  id: string;
  term: string;
  /** other ways the app writes the term, for search and for the help button's name */
  aliases?: string[];
  /** one sentence, shown beside the term */
  short: string;
  /** what a reader needs beyond the sentence */
  body?: string;
  /** formulas, one a line, in the planner's notation */
  formulas?: string[];
  /** published sources; "trade term" for words of the field without one author */
  sources: string[];
  group: GlossaryGroup;
};

export const GLOSSARY_GROUPS = ['Choices and views', 'The reversal zone and design criteria', 'Pairs and blocks', 'Discount models', 'Estimation and choice noise', 'Power and tests', 'Real rewards'] as const;
export type GlossaryGroup = (typeof GLOSSARY_GROUPS)[number];

const GREEN_1994 = 'Green, L., Fristoe, N., & Myerson, J. (1994). Temporal discounting and preference reversals in choice between delayed outcomes. Psychonomic Bulletin & Review, 1(3), 383–389.';
const KIRBY_1995 = 'Kirby, K. N., & Herrnstein, R. J. (1995). Preference reversals due to myopic discounting of delayed reward. Psychological Science, 6(2), 83–89.';
const MAZUR_1987 =
  'Mazur, J. E. (1987). An adjusting procedure for studying delayed reinforcement. In M. L. Commons, J. E. Mazur, J. A. Nevin, & H. Rachlin (Eds.), Quantitative analyses of behavior, Vol. 5 (pp. 55–73). Erlbaum.';
const GREEN_1997 = 'Green, L., Myerson, J., & McFadden, E. (1997). Rate of temporal discounting decreases with amount of reward. Memory & Cognition, 25(5), 715–723.';
const BRENT_1973 = 'Brent, R. P. (1973). Algorithms for Minimization without Derivatives. Prentice-Hall (chapter 5, the bracketed one-dimensional minimiser).';
const HERE = 'Switchback’s own design rule, derived from the definitions above (no separate publication).';

export const GLOSSARY: GlossaryEntry[] = [
  // Choices and views
  {
    id: 'ss-ll',
    term: 'SS and LL',
    aliases: ['smaller-sooner', 'larger-later'],
    short: 'SS is the smaller-sooner reward S, LL the larger-later reward L.',
    body: 'Every question offers S after the sooner delay or L after the later delay. The magnitude ratio x = S/L lies strictly between 0 and 1.',
    formulas: ['x = S / L, 0 < x < 1'],
    sources: ['Trade terms of intertemporal-choice research.'],
    group: 'Choices and views',
  },
  {
    id: 'far-near-view',
    term: 'Far view and near view',
    aliases: ['far view', 'near view', 'question pair'],
    short: 'The same two rewards asked twice: from today with both delayed (far), and again once the sooner one is immediate (near).',
    body: 'A question pair asks the far view “S in d days, or L in D days?” and the near view “S today, or L in D − d days?”. Both offer the same rewards with the same gap between them; only the standing day differs (0 for the far view, d for the near view).',
    formulas: ['far view: S at d vs L at D (seen from day 0)', 'near view: S at 0 vs L at D − d (seen from day d)'],
    sources: [GREEN_1994, KIRBY_1995],
    group: 'Choices and views',
  },
  {
    id: 'standing-day',
    term: 'Standing day',
    aliases: ['standing time', 't'],
    short: 'The day t from which a choice is seen: the value of an amount A due on day T is A·f(T − t).',
    body: 'The design page’s value chart moves the standing day from 0 (the far view) to d (the near view): the two value curves cross inside the reversal zone, which is the reversal.',
    formulas: ['V = A · f(T − t), T ≥ t'],
    sources: [GREEN_1994],
    group: 'Choices and views',
  },
  {
    id: 'patterns',
    term: 'Choice patterns LL, LS, SL, SS',
    aliases: ['LL', 'LS', 'SL', 'SS', 'choice pattern', 'pattern letters'],
    short: 'Two letters per pair, far view first: LL larger-later both times, LS a preference reversal, SL a reverse reversal, SS smaller-sooner both times.',
    body: 'LL: the larger-later reward in both views (expected of a late anchor). LS: larger-later from afar, smaller-sooner once it is immediate — the standard preference reversal (expected of a reversal probe). SL: the opposite switch, a reverse reversal; under the models here it arises only from choice noise. SS: the smaller-sooner reward in both views (expected of a soon anchor).',
    formulas: ['P(LS) = P(LL at far view) · P(SS at near view) (views answered independently)'],
    sources: [KIRBY_1995, GREEN_1994],
    group: 'Choices and views',
  },
  {
    id: 'magnitude-effect',
    term: 'Magnitude effect (k and K)',
    aliases: ['k', 'K', 'kSmall', 'kLarge'],
    short: 'Small rewards are discounted faster than large ones: k is the rate for the small reward, K for the large, per day.',
    body: 'Symbols keep their case on every page: k (small reward) and K (large reward) are different numbers. A prior sets the median of each and the spread of their logarithms (SD of ln k, SD of ln K) and their correlation.',
    sources: [GREEN_1997],
    group: 'Choices and views',
  },
  // Zone and criteria
  {
    id: 'reversal-zone',
    term: 'Reversal zone (D_lower, D_upper)',
    aliases: ['reversal zone', 'D_lower', 'D_upper', 'zone', 'zone width'],
    short: 'The late delays D at which a person picks LL in the far view and SS in the near view; it runs from D_lower to D_upper.',
    body: 'Below D_lower the larger-later reward wins in both views; above D_upper the smaller-sooner reward wins in both. For the hyperbolic model the zone is non-empty only when k > x·K; for the exponential model only when k > K. Zone width is D_upper − D_lower.',
    formulas: ['zone: A(D) > 0 and B(D) > 0', 'hyperbolic: D_lower = d + (1 − x)/(xK), D_upper = (1 + kd − x)/(xK)', 'exponential: D_lower = d + ln(1/x)/K, D_upper = (kd + ln(1/x))/K'],
    sources: [MAZUR_1987, GREEN_1994, 'Closed forms: solve A(D) = 0 and B(D) = 0 for D; checked against a numerical root finder in Switchback’s tests.'],
    group: 'The reversal zone and design criteria',
  },
  {
    id: 'preference-gaps',
    term: 'Preference gaps A and B',
    aliases: ['far gap', 'near gap', 'A', 'B'],
    short: 'How strongly each view prefers its expected answer, in units of L: A for LL in the far view, B for SS in the near view.',
    formulas: ['A(D) = f_K(D) − x · f_k(d)', 'B(D) = x · f_k(0) − f_K(D − d)'],
    sources: [HERE],
    group: 'The reversal zone and design criteria',
  },
  {
    id: 'gap-product',
    term: 'Gap product A·B (× L²)',
    aliases: ['gap product', 'A·B', 'C(D)', '× L²'],
    short: 'The far-view gap times the near-view gap; largest where both views are clear-cut. Written × L² because each gap is a share of L.',
    body: 'Positive only inside the reversal zone and zero at both edges, so its maximum sits well inside the zone, where noise is least likely to undo either answer. Switchback finds the maximum with a bracketed one-dimensional optimiser.',
    formulas: ['C(D) = A(D) · B(D) on D_lower < D < D_upper'],
    sources: [HERE, BRENT_1973],
    group: 'The reversal zone and design criteria',
  },
  {
    id: 'maximin-gap',
    term: 'Maximin gap',
    aliases: ['maximin', 'smallest gap'],
    short: 'The smallest of the two gaps over a set of prior scenarios; maximising it makes the weakest case as clear as possible.',
    body: 'In units of L (not L²). Positive only if the pair is inside every scenario’s zone; below 0 means it is outside at least one.',
    formulas: ['maximin = min over scenarios of min(A, B)'],
    sources: ['Wald, A. (1945). Statistical decision functions which minimize the maximum risk. Annals of Mathematics, 46(2), 265–280 (the maximin principle).', HERE],
    group: 'The reversal zone and design criteria',
  },
  {
    id: 'expected-reversal-rate',
    term: 'Expected reversal rate',
    aliases: ['reversal rate'],
    short: 'The share of probe pairs expected to come out LS, averaged over the prior with logistic choice noise.',
    formulas: ['E_prior[ P(LL at far view) · P(SS at near view) ]'],
    sources: [HERE],
    group: 'The reversal zone and design criteria',
  },
  {
    id: 'model-discrimination',
    term: 'Model discrimination',
    aliases: ['model discrimination', 'Jeffreys divergence', 'Kullback–Leibler divergence', 'reversal weight', 'models told apart'],
    short: 'Chooses the probe delays where the hyperbolic and the exponential model predict the most different choices at the participant’s estimates, so the answers show which model fits.',
    body: 'The divergence is the symmetric Kullback–Leibler (Jeffreys) divergence between the two models’ predicted choice probabilities, summed over the far and near view, with the design’s logistic choice sensitivity γ. The reversal weight w adds w times the probability of a preference reversal under the design model: 0 is pure discrimination (probes may fall outside the reversal zone); a larger w pulls the probes back towards reversals. The compare page’s “models told apart” figure is the simulated share of participants whose better-fitting model is the true one. These are estimates from choices, not a clinical assessment.',
    formulas: ['J(p, q) = (p − q) · (logit p − logit q)', 'value = J_far + J_near + w · P(LL at far view) · P(SS at near view)'],
    sources: [
      'Box, G. E. P., & Hill, W. J. (1967). Discrimination among mechanistic models. Technometrics, 9(1), 57–71.',
      'Cavagnaro, D. R., Myung, J. I., Pitt, M. A., & Kujala, J. V. (2010). Adaptive design optimization: A mutual information-based approach to model discrimination in cognitive science. Neural Computation, 22(4), 887–905.',
      HERE,
    ],
    group: 'The reversal zone and design criteria',
  },
  {
    id: 'anchor-clarity',
    term: 'Anchor clarity',
    aliases: ['clarity'],
    short: 'For an anchor, the product of its two gaps taken with their expected signs; anchors are placed where it equals the probe’s gap product.',
    body: 'Late anchor: A·(−B); soon anchor: (−A)·B. Because the target is the probe’s gap product, the compare page shows clarity as a share of it: 100% unless the distance bound stopped the anchor first.',
    formulas: ['late anchor: A · (−B)', 'soon anchor: (−A) · B'],
    sources: [HERE],
    group: 'The reversal zone and design criteria',
  },
  // Pairs and blocks
  {
    id: 'pair-roles',
    term: 'Late anchor, reversal probe, soon anchor',
    aliases: ['late anchor', 'reversal probe', 'probe', 'soon anchor', 'pair role'],
    short: 'Probes put D inside the zone (expected LS); late anchors below it (expected LL); soon anchors above it (expected SS).',
    body: 'Anchors check that a person answers consistently outside the zone, so a probe’s LS can be read against them.',
    sources: [HERE],
    group: 'Pairs and blocks',
  },
  {
    id: 'calibration-block',
    term: 'Calibration block and probe block',
    aliases: ['calibration block', 'probe block', 'stage 1', 'stage 2'],
    short: 'Stage 1 asks questions that estimate each person’s k and K; stage 2 asks pairs built from those estimates.',
    body: 'Each calibration question is an exact tie at one rate on a log-spaced grid. With n questions per reward size, consistent answers can give only n + 1 different estimates per size, which is why estimates cluster on a few values.',
    sources: [HERE],
    group: 'Pairs and blocks',
  },
  // calibration that covers the probes (issue 15)
  {
    id: 'calibration-spanning-probes',
    term: 'Calibration delays spanning the probes',
    aliases: ['span-probes', 'spanning calibration', 'stage-1 model'],
    short: 'The calibration block’s later delays reach the late delays the probes will use across the prior, in a few log-spaced levels, each asking across the rates.',
    body:
      'Rates estimated on short delays misplace the zone at long ones when true delay sensitivity is below 1. Spanning the probes puts calibration questions where the probes go; with several delay levels a stage-1 model with delay sensitivity s (hyperboloid, power-delay or exponential-power) can estimate s with k and K, and the probes are built under that model. With one delay per rate (the default block), s and k cannot be told apart.',
    formulas: [
      'longest calibration delay = max(set longest, 95 % quantile over the prior of a person’s longest probe late delay)',
      'delay levels: D_j = D_max·(D_min/D_max)^(j/(m−1)), m = 3 from 9 items per reward size, else 2',
      'stage 1 with s: (k̂, K̂, ŝ) = argmax Σ ln P(choice | k or K, s), one s for both reward sizes',
    ],
    sources: [HERE, 'Myerson, J., & Green, L. (1995). Discounting of delayed rewards: Models of individual choice. Journal of the Experimental Analysis of Behavior, 64(3), 263–276.'],
    group: 'Pairs and blocks',
  },
  {
    id: 'delay-sensitivity',
    term: 'Delay sensitivity s',
    aliases: ['delay sensitivity', 's'],
    short: 'The exponent on delay in the hyperboloid, power-delay and exponential-power models; below 1, long delays are discounted less steeply than the model with s = 1 predicts.',
    formulas: ['f(D) = (1 + kD)^(−s), 1/(1 + k·D^s), exp(−k·D^s)'],
    sources: [
      'Myerson, J., & Green, L. (1995). Discounting of delayed rewards: Models of individual choice. Journal of the Experimental Analysis of Behavior, 64(3), 263–276.',
      'Ebert, J. E. J., & Prelec, D. (2007). The fragility of time: Time-insensitivity and valuation of the near and far future. Management Science, 53(9), 1423–1438.',
    ],
    group: 'Estimation and choice noise',
  },
  {
    id: 'adaptive-calibration',
    term: 'Adaptive calibration (adaptive design optimisation)',
    aliases: ['adaptive calibration', 'adaptive design optimisation', 'expected information gain', 'candidate set'],
    short: 'Stage 1 asks one question at a time, each the candidate expected to tell most about this person’s k and K given the answers so far.',
    body: 'A posterior over ln k, ln K (and the delay sensitivity where the model has it) starts at the study’s prior and is updated after each answer with the design’s choice model. The next question, from a fixed candidate set of amounts × delays, maximises the mutual information between its answer and the rates. Calibration stops after the most items allowed or once the posterior SD of ln k and ln K is below the target; stage 2 is built at the posterior medians.',
    formulas: ['I(c) = H(p̄_c) − Σ_θ π(θ) H(p_c(θ)),  H(p) = −p ln p − (1 − p) ln(1 − p)'],
    sources: [
      'Myung, J. I., Cavagnaro, D. R., & Pitt, M. A. (2013). A tutorial on adaptive design optimization. Journal of Mathematical Psychology, 57(3–4), 53–67.',
      'Cavagnaro, D. R., Myung, J. I., Pitt, M. A., & Kujala, J. V. (2010). Adaptive design optimization: A mutual information-based approach to model discrimination in cognitive science. Neural Computation, 22(4), 887–905.',
    ],
    group: 'Pairs and blocks',
  },
  {
    id: 'frozen-design',
    term: 'Frozen design',
    aliases: ['frozen version', 'freeze'],
    short: 'An unchangeable, numbered copy of a design and its prior’s values, named by the SHA-256 hash of its canonical JSON (keys sorted at every level, no white space).',
    sources: ['NIST FIPS 180-4 (2015), Secure Hash Standard (SHA-256).'],
    group: 'Pairs and blocks',
  },
  // Models
  {
    id: 'model-exponential',
    term: 'Exponential model',
    aliases: ['exponential'],
    short: 'f(D) = exp(−kD): a constant rate per day.',
    formulas: ['f(D) = exp(−kD), k > 0'],
    sources: ['Samuelson, P. A. (1937). A note on measurement of utility. Review of Economic Studies, 4(2), 155–161.'],
    group: 'Discount models',
  },
  {
    id: 'model-hyperbolic',
    term: 'Hyperbolic model',
    aliases: ['hyperbolic', 'Mazur'],
    short: 'f(D) = 1/(1 + kD).',
    formulas: ['f(D) = 1 / (1 + kD), k > 0'],
    sources: [MAZUR_1987],
    group: 'Discount models',
  },
  {
    id: 'model-hyperboloid',
    term: 'Hyperboloid model',
    aliases: ['hyperboloid', 'Myerson & Green', 'delay sensitivity s'],
    short: 'f(D) = (1 + kD)^(−s), with delay sensitivity s.',
    formulas: ['f(D) = (1 + kD)^(−s), k > 0, s > 0'],
    sources: ['Myerson, J., & Green, L. (1995). Discounting of delayed rewards: Models of individual choice. Journal of the Experimental Analysis of Behavior, 64(3), 263–276.'],
    group: 'Discount models',
  },
  {
    id: 'model-power-delay',
    term: 'Power-delay hyperbola',
    aliases: ['power-delay', 'Rachlin'],
    short: 'f(D) = 1/(1 + k·D^s).',
    formulas: ['f(D) = 1 / (1 + k·D^s), k > 0, s > 0'],
    sources: ['Rachlin, H. (2006). Notes on discounting. Journal of the Experimental Analysis of Behavior, 85(3), 425–435.'],
    group: 'Discount models',
  },
  {
    id: 'model-exponential-power',
    term: 'Exponential with delay sensitivity',
    aliases: ['exponential-power', 'constant sensitivity'],
    short: 'f(D) = exp(−k·D^s), the constant-sensitivity family.',
    formulas: ['f(D) = exp(−k·D^s), k > 0, s > 0'],
    sources: ['Ebert, J. E. J., & Prelec, D. (2007). The fragility of time: Time-insensitivity and valuation of the near and far future. Management Science, 53(9), 1423–1438.'],
    group: 'Discount models',
  },
  {
    id: 'model-quasi-hyperbolic',
    term: 'Quasi-hyperbolic (β–δ) model',
    aliases: ['quasi-hyperbolic', 'present bias β'],
    short: 'f(0) = 1 and f(D) = β·exp(−kD) for D > 0: every delay costs a one-off factor β.',
    formulas: ['f(D) = 1 if D = 0, else β·exp(−kD), 0 < β ≤ 1, k > 0'],
    sources: ['Laibson, D. (1997). Golden eggs and hyperbolic discounting. Quarterly Journal of Economics, 112(2), 443–477.'],
    group: 'Discount models',
  },
  // Estimation and noise
  {
    id: 'choice-noise',
    term: 'Choice sensitivity γ and lapse rate ε',
    aliases: ['choice sensitivity', 'γ', 'lapse', 'ε', 'logistic choice'],
    short: 'How sharply choices follow the value difference (γ, per unit of L), and the share of answers given at random (ε).',
    formulas: ['P(LL) = 1 / (1 + exp(−γ · (V_LL − V_SS) / L))', 'with lapses: ε/2 + (1 − ε) · P(LL)'],
    sources: ['McFadden, D. (1974). Conditional logit analysis of qualitative choice behavior. In P. Zarembka (Ed.), Frontiers in Econometrics (pp. 105–142). Academic Press.'],
    group: 'Estimation and choice noise',
  },
  {
    id: 'estimate',
    term: 'Rate estimate and SE ln k',
    aliases: ['estimate', 'SE ln k', 'SE ln K', 'maximum likelihood'],
    short: 'Each person’s k and K are maximum-likelihood estimates from their calibration choices; SE ln k is the standard error of ln k.',
    body: 'Estimation works in ln k, so the standard error is on the log scale: k × exp(±1.96·SE) is an approximate 95% interval. Estimates describe hypothetical choices; they are not a clinical assessment.',
    sources: ['Fisher, R. A. (1922). On the mathematical foundations of theoretical statistics. Philosophical Transactions of the Royal Society A, 222, 309–368.'],
    group: 'Estimation and choice noise',
  },
  {
    id: 'prior',
    term: 'Prior (median, SD of ln k, correlation)',
    aliases: ['prior set', 'SD of ln k', 'spread'],
    short: 'A log-normal distribution of (k, K) across people: medians, spreads of ln k and ln K, and their correlation.',
    body: 'A prior can be typed in, or fitted from a pilot file: either per-person rates, or raw pilot choices, which are first estimated with the calibration block’s own estimator.',
    formulas: ['(ln k, ln K) ~ bivariate normal(ln median_k, ln median_K, SD_k, SD_K, ρ)'],
    sources: ['Common practice for positive, right-skewed rates.'],
    group: 'Estimation and choice noise',
  },
  // Power and tests
  {
    id: 'mcnemar',
    term: 'McNemar test',
    aliases: ['McNemar', 'discordant pairs'],
    short: 'Compares LS with SL among the discordant pairs: more LS than chance says reversals are systematic, not noise.',
    formulas: ['exact: LS ~ Binomial(LS + SL, 1/2) under no effect'],
    sources: ['McNemar, Q. (1947). Note on the sampling error of the difference between correlated proportions or percentages. Psychometrika, 12(2), 153–157.'],
    group: 'Power and tests',
  },
  {
    id: 'power',
    term: 'Power and its Wilson interval',
    aliases: ['power', 'Wilson'],
    short: 'The share of simulated studies whose test gives p < α, with a Wilson score interval for the simulation’s own uncertainty.',
    formulas: ['(p̂ + z²/2n ± z·√(p̂(1 − p̂)/n + z²/4n²)) / (1 + z²/n)'],
    sources: ['Wilson, E. B. (1927). Probable inference, the law of succession, and statistical inference. Journal of the American Statistical Association, 22(158), 209–212.'],
    group: 'Power and tests',
  },
  {
    id: 'stress-truth',
    term: 'Stress truth',
    aliases: ['stress truths'],
    short: 'A named way the simulated people differ from what the design assumes (another model, another delay sensitivity), to see how much power survives.',
    sources: [HERE],
    group: 'Power and tests',
  },
  // Real rewards
  {
    id: 'random-incentive-system',
    term: 'Random incentive system',
    aliases: ['random incentive', 'real rewards', 'paid choice'],
    short: 'One of each participant’s choices is drawn at random and paid exactly as chosen, so every choice is worth answering as if it were real.',
    body: 'Switchback draws uniformly from every answered calibration and probe item (attention checks excluded), with a recorded seed, when the session completes; the chosen amount (at most the cap) is due on the completion date plus the chosen option’s delay.',
    formulas: ['drawn index = ⌊u · n⌋, u the first uniform of the seeded generator, n eligible items', 'due date = completion date + delay of the chosen option'],
    sources: ['Starmer, C., & Sugden, R. (1991). Does the random-lottery incentive system elicit true preferences? An experimental investigation. American Economic Review, 81(4), 971–978.'],
    group: 'Real rewards',
  },
  {
    id: 'payout-ledger',
    term: 'Payout ledger',
    aliases: ['payouts', 'ledger'],
    short: 'Who is owed what and when: one line per paid participant with the drawn item, the amount in exact minor units, the due date, its status and the payment service’s reference.',
    sources: ['Trade term.'],
    group: 'Real rewards',
  },
];

const BY_ID = new Map(GLOSSARY.map((e) => [e.id, e]));

/** The entry with this id; throws for an unknown id so a typo fails in tests, not silently on a page. */
export function glossaryEntry(id: string): GlossaryEntry {
  const entry = BY_ID.get(id);
  if (!entry) throw new Error(`No glossary entry "${id}"`);
  return entry;
}

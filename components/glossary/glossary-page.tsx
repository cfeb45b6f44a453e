import { GLOSSARY, GLOSSARY_GROUPS } from '@/lib/shared/glossary';

/** Every term the app uses, grouped, with its formula and published source; each entry has an anchor the help buttons link to. */
export function GlossaryPage() {
  return (
    <div className="space-y-8">
      <div className="max-w-3xl space-y-2">
        <h1>Methods and glossary</h1>
        <p className="text-sm text-ink-soft">
          The words, symbols and formulas on Switchback’s pages. Formulas take the large amount L as 1 and the small amount as S = x·L; k is the discount rate for the
          small reward and K for the large one, per day; d is the soon delay and D the late delay, in days. Sources are the published papers the methods come from;
          entries marked as Switchback’s own rule follow from the definitions above them.
        </p>
        <nav aria-label="Glossary sections" className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
          {GLOSSARY_GROUPS.map((g) => (
            <a key={g} href={`#${groupId(g)}`} className="text-teal-700 underline">
              {g}
            </a>
          ))}
        </nav>
      </div>
      {GLOSSARY_GROUPS.map((group) => (
        <section key={group} aria-labelledby={groupId(group)} className="space-y-3">
          <h2 id={groupId(group)}>{group}</h2>
          <dl className="grid gap-3 lg:grid-cols-2">
            {GLOSSARY.filter((e) => e.group === group).map((e) => (
              <div key={e.id} id={e.id} className="scroll-mt-4 rounded-lg border border-ink/10 bg-paper-raised p-4 target:border-teal-500 target:ring-2 target:ring-teal-200" data-testid="glossary-entry">
                <dt className="font-semibold">{e.term}</dt>
                <dd className="mt-1 space-y-2 text-sm">
                  <p>{e.short}</p>
                  {e.body ? <p className="text-ink-soft">{e.body}</p> : null}
                  {e.formulas?.length ? (
                    <ul className="space-y-1 rounded-md bg-paper-sunk px-3 py-2 font-mono text-xs" aria-label={`Formulas for ${e.term}`}>
                      {e.formulas.map((f) => (
                        <li key={f} className="break-words">
                          {f}
                        </li>
                      ))}
                    </ul>
                  ) : null}
                  <div className="text-xs text-ink-soft">
                    <span className="font-medium">Source{e.sources.length > 1 ? 's' : ''}: </span>
                    {e.sources.map((s) => (
                      <span key={s} className="block">
                        {s}
                      </span>
                    ))}
                  </div>
                </dd>
              </div>
            ))}
          </dl>
        </section>
      ))}
    </div>
  );
}

function groupId(group: string): string {
  return `group-${group.toLowerCase().replace(/[^a-z]+/g, '-')}`;
}

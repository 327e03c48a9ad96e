import type { CriterionStatus } from '../../../../shared/clinical/definition-results.js';
import type { DefinitionView } from '../outcome-evaluation.js';

const STATUS: Record<CriterionStatus, { mark: string; word: string; cls: string }> = {
  met: { mark: '✓', word: 'Met', cls: 'text-ok' },
  'not-met': { mark: '✗', word: 'Not met', cls: 'text-danger' },
  missing: { mark: '?', word: 'Missing', cls: 'text-ochre' },
};

/** Which definition criteria the evidence meets, which are not met and which lack evidence, and why. */
export function DefinitionsView({ views, invalid, title = 'Definitions evaluated as you type' }: { views: DefinitionView[]; invalid: number; title?: string }) {
  if (!views.length) return null;
  return (
    <section className="rounded border border-line bg-panel p-2" aria-label={title}>
      <h4 className="mb-1 text-sm font-semibold">{title}</h4>
      {invalid > 0 && <p className="mb-1 text-xs text-ochre">{invalid} observation{invalid === 1 ? ' is' : 's are'} not complete yet and {invalid === 1 ? 'is' : 'are'} left out.</p>}
      <ul className="flex flex-col gap-1">
        {views.map((v) => (
          <li key={v.id + v.name}>
            <details>
              <summary className="cursor-pointer text-sm">
                <span className="font-semibold">{v.name}{v.version && ` (version ${v.version})`}: </span>
                {v.error ? <span className="text-ochre">cannot evaluate yet: {v.error}</span> : v.met === null ? <span>{v.summary}</span> : <span className={v.met ? 'text-ok' : 'text-ink'}>{v.met ? '✓ ' : '✗ '}{v.summary}</span>}
              </summary>
              {v.criteria.length > 0 && (
                <table className="mt-1 w-full text-left text-xs">
                  <thead className="text-muted"><tr><th scope="col" className="py-0.5 pr-2">Criterion</th><th scope="col" className="pr-2">Result</th><th scope="col">Why</th></tr></thead>
                  <tbody>
                    {v.criteria.map((c) => (
                      <tr key={c.id} className="border-t border-line/60 align-top">
                        <td className="py-0.5 pr-2">{c.label}</td>
                        <td className={`whitespace-nowrap pr-2 font-semibold ${STATUS[c.status].cls}`}><span aria-hidden="true">{STATUS[c.status].mark} </span>{STATUS[c.status].word}</td>
                        <td>{c.reason}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              )}
              {v.source && <p className="mt-1 text-xs text-muted">Source: {v.source}</p>}
            </details>
          </li>
        ))}
      </ul>
    </section>
  );
}

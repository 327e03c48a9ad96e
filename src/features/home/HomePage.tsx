import { Link } from 'react-router-dom';
import type { Role } from '../../../shared/auth/roles.js';
import { ROLE_LABELS } from '../../../shared/auth/roles.js';
import { PageHeader, Panel } from '../../components/ui.js';
import { useSession } from '../../lib/session.js';

interface Task { title: string; text: string; to: string }

/** What each role has to do today; each card leads to the page where the work is done. */
const TASKS: Record<Role, Task[]> = {
  abstractor: [
    { title: 'Your worklist', text: 'Cases missing required data, follow-up windows closing, cases waiting for a second check.', to: '/worklist' },
    { title: 'Enter a case', text: 'A new surgical case with its therapy and outcomes.', to: '/cases/new' },
    { title: 'Import a theatre list', text: 'Spreadsheet import with a dry run before anything is written.', to: '/imports' },
  ],
  analyst: [
    { title: 'Build a cohort', text: 'Filter the registry and read its rates with confidence intervals.', to: '/cohorts' },
    { title: 'Compare', text: 'Before and after the protocol, therapy or not, one site against the rest.', to: '/cohorts/compare' },
    { title: 'Verify cases', text: 'Cases entered by others that wait for a second check.', to: '/worklist' },
  ],
  committee: [
    { title: 'Monthly charts', text: 'Run charts and control charts of every measure, with signals explained.', to: '/committee' },
    { title: 'Reviews and actions', text: 'Record what the committee saw and decided; follow open actions.', to: '/committee/reviews' },
  ],
  researcher: [
    { title: 'Request a dataset', text: 'De-identified, analysis-ready files with a data dictionary.', to: '/exports' },
    { title: 'Data dictionary', text: 'Every variable with its type, unit, allowed values and definition.', to: '/dictionary' },
  ],
  admin: [
    { title: 'Users', text: 'Invite people, assign roles and sites, send password resets.', to: '/admin/users' },
    { title: 'Sites and units', text: 'Hospitals of the network and their surveillance populations.', to: '/admin/sites' },
    { title: 'Export approvals', text: 'Research dataset requests waiting for a decision.', to: '/exports' },
  ],
};

export function HomePage() {
  const { data } = useSession();
  const user = data!.user;
  return (
    <div>
      <PageHeader title={`Today, ${user.displayName.split(' ')[0]}`} subtitle={`Signed in as ${user.roles.map((r) => ROLE_LABELS[r]).join(', ')}`} />
      {user.roles.map((role) => (
        <section key={role} className="mb-6" aria-labelledby={`tasks-${role}`}>
          <h2 id={`tasks-${role}`} className="mb-2 text-sm font-semibold uppercase tracking-wide text-muted">{ROLE_LABELS[role]}</h2>
          <div className="grid gap-3 md:grid-cols-3">
            {TASKS[role].map((t) => (
              <Link key={t.to} to={t.to} className="block rounded border border-line bg-panel p-4 hover:border-accent focus-visible:border-accent">
                <Panel className="border-0 p-0" title={t.title}><p className="text-sm text-muted">{t.text}</p></Panel>
              </Link>
            ))}
          </div>
        </section>
      ))}
    </div>
  );
}

import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Button, ClinicalCaution, ErrorState, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { ApiError } from '../../lib/api-client.js';
import { useAbandon, useCommit, useDryRun, useImport } from './api/imports.js';
import { CountsTable } from './components/CountsTable.js';
import { JobProgress } from './components/JobProgress.js';
import { MappingEditor } from './components/MappingEditor.js';
import { ProblemsTable } from './components/ProblemsTable.js';
import { importPaths } from './paths.js';

const STATUS_TEXT: Record<string, string> = {
  uploaded: 'Uploaded: map the columns', validating: 'Dry run in progress', validated: 'Dry run done', committing: 'Committing',
  committed: 'Committed', failed: 'Stopped with an error', abandoned: 'Abandoned',
};

/** One import: mapping, dry run with its problems, commit with the existing-row policy. */
export function ImportPage() {
  const { id = '' } = useParams();
  const q = useImport(id);
  const dryRun = useDryRun(id);
  const commit = useCommit(id);
  const abandon = useAbandon(id);
  const [policy, setPolicy] = useState<'skip' | 'update'>('skip');
  const [confirmReupload, setConfirmReupload] = useState(false);
  const [remap, setRemap] = useState(false);
  if (q.isLoading) return <Loading what="the import" />;
  if (q.error || !q.data) return <ErrorState error={q.error} retry={() => q.refetch()} />;
  const v = q.data;
  const open = !['committed', 'abandoned', 'validating', 'committing'].includes(v.status);
  const showMapping = open && (v.status === 'uploaded' || remap || (v.status === 'failed' && !v.counts));
  const rejected = v.counts?.rejected ?? 0;

  return (
    <div className="flex flex-col gap-4">
      <PageHeader title={`Import of ${v.fileName}`} subtitle={<span className="tabular-nums">{STATUS_TEXT[v.status]} · site {v.siteCode} · {v.sheets.reduce((n, s) => n + s.rows, 0).toLocaleString()} rows · SHA-256 {v.fileHash.slice(0, 12)}…</span>}
        actions={<Link className="text-sm font-semibold text-accent hover:underline" to={importPaths.history}>Import history</Link>} />
      {v.error && v.status !== 'committed' && <Notice tone="danger">{v.error}</Notice>}
      {(v.status === 'validating' || v.status === 'committing') && (
        <Panel><JobProgress jobId={v.status === 'validating' ? v.dryRunJobId : v.commitJobId} phase={v.status === 'validating' ? 'dry run' : 'commit'} /></Panel>
      )}
      {showMapping && (
        <Panel title="3. Map the columns">
          <p className="mb-3 text-sm">Headers that match a registry field or its label are mapped already. Map the rest, or leave them out: a left-out column is not read and never stored.</p>
          <MappingEditor sheets={v.sheets} siteId={v.siteId} initial={v.mapping} busy={dryRun.isPending}
            onSubmit={(mapping, savePresetAs) => dryRun.mutate({ mapping, savePresetAs }, { onSuccess: () => setRemap(false) })} />
          {dryRun.error && <div className="mt-3"><ErrorState error={dryRun.error} /></div>}
          {dryRun.error instanceof ApiError && dryRun.error.fields.length > 1 && (
            <ul className="mt-2 list-disc pl-5 text-sm text-danger">{dryRun.error.fields.map((f) => <li key={f.path}>{f.message}</li>)}</ul>
          )}
        </Panel>
      )}
      {v.counts && (v.status === 'validated' || v.status === 'committed' || v.status === 'failed') && (
        <Panel title={v.status === 'committed' ? 'What was imported' : '4. Dry run result'}>
          <CountsTable counts={v.counts} />
          <p className="mt-2 text-sm tabular-nums">{v.counts.duplicates} possible duplicate{v.counts.duplicates === 1 ? '' : 's'} (same hospital identifier and surgery date) · {v.counts.warnings} warning{v.counts.warnings === 1 ? '' : 's'}</p>
          {v.status === 'committed' && v.counts.written !== undefined && <p className="mt-1 text-sm tabular-nums">{v.counts.written.toLocaleString()} records written, {v.counts.skipped ?? 0} skipped.</p>}
          {v.counts.warnings > 0 && <div className="mt-2"><ClinicalCaution /></div>}
          <h3 className="mb-2 mt-4 text-sm font-semibold">Problems</h3>
          <ProblemsTable importId={v.id} total={v.problemCount} />
        </Panel>
      )}
      {v.status === 'validated' && !remap && (
        <Panel title="5. Commit">
          {rejected > 0 ? (
            <Notice tone="danger">{rejected.toLocaleString()} row{rejected === 1 ? ' was' : 's were'} rejected. An import writes all rows or none: download the problems, fix the file and upload it again.</Notice>
          ) : (
            <form className="flex flex-col gap-3" aria-label="Commit the import" onSubmit={(e) => { e.preventDefault(); commit.mutate({ existing: policy, confirmReupload: confirmReupload || undefined }); }}>
              <fieldset className="flex flex-col gap-1">
                <legend className="text-sm font-semibold">Rows for cases already in the registry (by registry case number)</legend>
                <label className="text-sm"><input type="radio" name="policy" checked={policy === 'skip'} onChange={() => setPolicy('skip')} /> Skip them (keep the registry as it is)</label>
                <label className="text-sm"><input type="radio" name="policy" checked={policy === 'update'} onChange={() => setPolicy('update')} /> Update them (each change is recorded in the case&rsquo;s audit trail as an import)</label>
              </fieldset>
              {v.previousImport && (
                <Notice tone="warn">
                  <p>This file was already imported{v.previousImport.committedAt ? ` on ${v.previousImport.committedAt.slice(0, 10)}` : ''} (“{v.previousImport.fileName}”).</p>
                  <label className="mt-1 block"><input type="checkbox" checked={confirmReupload} onChange={(e) => setConfirmReupload(e.target.checked)} /> Import it again anyway</label>
                </Notice>
              )}
              {commit.error && <ErrorState error={commit.error} />}
              <div className="flex gap-2">
                <Button type="submit" disabled={commit.isPending || (!!v.previousImport && !confirmReupload)}>Commit {(v.counts!.new + (policy === 'update' ? v.counts!.updated : 0)).toLocaleString()} rows</Button>
              </div>
            </form>
          )}
        </Panel>
      )}
      {open && (
        <div className="flex gap-2">
          {v.status !== 'uploaded' && !remap && <Button variant="secondary" onClick={() => setRemap(true)}>Change the mapping</Button>}
          <Button variant="danger" onClick={() => abandon.mutate({})} disabled={abandon.isPending}>Abandon this import (delete the file)</Button>
        </div>
      )}
      {v.status === 'committed' && <p className="text-sm"><Link className="font-semibold text-accent hover:underline" to="/cases">Open the case list</Link></p>}
    </div>
  );
}

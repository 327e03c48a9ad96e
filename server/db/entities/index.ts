// Every entity, listed as imported classes (globs fail under vitest; see DEVELOPERS.md).
import { Site } from './site.js';
import { Unit } from './unit.js';
import { User } from './user.js';
import { UserSite } from './user-site.js';
import { AuthToken } from './auth-token.js';
import { AuditEntry } from './audit-entry.js';
import { MailMessage } from './mail-message.js';
import { Setting } from './setting.js';
import { Job } from './job.js';
import { SurgicalCase } from './surgical-case.js';
import { TherapyEpisodeRow } from './therapy-episode.js';
import { OutcomeEventRow } from './outcome-event.js';
import { ImportJob } from './import-job.js';
import { MappingPreset } from './mapping-preset.js';
import { committeeEntities } from './committee.js';
import { ExportRequest } from './export-request.js';
import { ExportDownload } from './export-download.js';
import { SavedCohort } from './saved-cohort.js';
import { qualityEntities } from './quality.js';

export { Site, Unit, User, UserSite, AuthToken, AuditEntry, MailMessage, Setting, Job, SurgicalCase, TherapyEpisodeRow, OutcomeEventRow, ImportJob, MappingPreset, ExportRequest, ExportDownload, SavedCohort };
export const entities = [Site, Unit, User, UserSite, AuthToken, AuditEntry, MailMessage, Setting, Job, SurgicalCase, TherapyEpisodeRow, OutcomeEventRow, ImportJob, MappingPreset, ExportRequest, ExportDownload, SavedCohort, ...committeeEntities, ...qualityEntities];

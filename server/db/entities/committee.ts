// The committee review's entities (issue 7), listed once so the shared index adds them in one place.
import { CommitteeMeasureSetting } from './committee-measure-setting.js';
import { CommitteeAnnotation } from './committee-annotation.js';
import { CommitteeMonthClose } from './committee-month-close.js';
import { CommitteeMonthRollup } from './committee-month-rollup.js';
import { CommitteeReview } from './committee-review.js';
import { CommitteeFinding } from './committee-finding.js';
import { CommitteeAction } from './committee-action.js';
import { CommitteeSignalNotice } from './committee-signal-notice.js';

export { CommitteeMeasureSetting, CommitteeAnnotation, CommitteeMonthClose, CommitteeMonthRollup, CommitteeReview, CommitteeFinding, CommitteeAction, CommitteeSignalNotice };
export const committeeEntities = [CommitteeMeasureSetting, CommitteeAnnotation, CommitteeMonthClose, CommitteeMonthRollup, CommitteeReview, CommitteeFinding, CommitteeAction, CommitteeSignalNotice];

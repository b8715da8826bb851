import { AppSetting } from "./app-setting.entity";
import { DesignRevision } from "./design-revision.entity";
import { Design } from "./design.entity";
import { GradeSweep } from "./grade-sweep.entity";
import { Grade } from "./grade.entity";
import { Invitation } from "./invitation.entity";
import { LimitSet } from "./limit-set.entity";
import { MeasuredResponse } from "./measured-response.entity";
import { OutboxMessage } from "./outbox-message.entity";
import { PasswordReset } from "./password-reset.entity";
import { ReviewEvent } from "./review-event.entity";
import { RunComment } from "./run-comment.entity";
import { RunResultRow } from "./run-result.entity";
import { Run } from "./run.entity";
import { Session } from "./session.entity";
import { User } from "./user.entity";

export { AppSetting, Design, DesignRevision, Grade, GradeSweep, Invitation, LimitSet, MeasuredResponse, OutboxMessage, PasswordReset, ReviewEvent, Run, RunComment, RunResultRow, Session, User };

/** Every entity, for the DataSource. */
export const entities = [User, Session, Invitation, PasswordReset, OutboxMessage, Design, DesignRevision, LimitSet, Grade, Run, RunResultRow, RunComment, ReviewEvent, MeasuredResponse, GradeSweep, AppSetting];

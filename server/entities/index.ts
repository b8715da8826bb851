import { Invitation } from "./invitation.entity";
import { OutboxMessage } from "./outbox-message.entity";
import { PasswordReset } from "./password-reset.entity";
import { Session } from "./session.entity";
import { User } from "./user.entity";

export { Invitation, OutboxMessage, PasswordReset, Session, User };

/** Every entity, for the DataSource. */
export const entities = [User, Session, Invitation, PasswordReset, OutboxMessage];

import { SessionRow } from '../auth/session.entity';
import { PasswordReset } from '../features/auth/password-reset.entity';
import { Basemap } from '../features/basemaps/basemap.entity';
import { FitEventEntity } from '../features/fits/fit-event.entity';
import { FitEntity } from '../features/fits/fit.entity';
import { MapVersion } from '../features/map/map-version.entity';
import { LocalMail } from '../features/mail/local-mail.entity';
import { MailRequest } from '../features/mail/mail-request.entity';
import { OutboxMessage } from '../features/mail/outbox-message.entity';
import { Invitation } from '../features/members/invitation.entity';
import { RecordFile } from '../features/records/record-file.entity';
import { RecordSeries } from '../features/records/record-series.entity';
import { RecordEntity } from '../features/records/record.entity';
import { Membership } from '../features/sites/membership.entity';
import { Site } from '../features/sites/site.entity';
import { User } from '../features/users/user.entity';
import { Well } from '../features/wells/well.entity';

export const entities = [User, SessionRow, Site, Membership, Invitation, PasswordReset, OutboxMessage, LocalMail, MailRequest, Well, RecordEntity, RecordFile, RecordSeries, FitEntity, FitEventEntity, MapVersion, Basemap];

import 'server-only';
import { sequelize } from '@/lib/db';
import { AuditEvent } from './AuditEvent';
import { AuthToken } from './AuthToken';
import { Coop } from './Coop';
import { Invitation } from './Invitation';
import { Membership } from './Membership';
import { SignInAttempt } from './SignInAttempt';
import { User } from './User';

// Explicit wiring: every model is initialised here, once, and associations are declared in one place.
Coop.initModel(sequelize);
User.initModel(sequelize);
Membership.initModel(sequelize);
Invitation.initModel(sequelize);
AuthToken.initModel(sequelize);
AuditEvent.initModel(sequelize);
SignInAttempt.initModel(sequelize);

Coop.hasMany(Membership, { foreignKey: 'coopId', as: 'memberships' });
Membership.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });
User.hasMany(Membership, { foreignKey: 'userId', as: 'memberships' });
Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' });
Invitation.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });
Invitation.belongsTo(User, { foreignKey: 'invitedByUserId', as: 'invitedBy' });
AuthToken.belongsTo(User, { foreignKey: 'userId', as: 'user' });
AuditEvent.belongsTo(User, { foreignKey: 'actorUserId', as: 'actor' });
AuditEvent.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });


export { sequelize, AuditEvent, AuthToken, Coop, Invitation, Membership, SignInAttempt, User };

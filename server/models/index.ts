import type { Sequelize } from 'sequelize'
import { Newsroom } from './Newsroom'
import { User } from './User'
import { Membership } from './Membership'
import { Invitation } from './Invitation'
import { AuditEvent } from './AuditEvent'
import { SignInAttempt } from './SignInAttempt'
import { Dataset } from './Dataset'
import { DatasetColumn } from './DatasetColumn'
import { Investigation } from './Investigation'
import { Block } from './Block'
import { BlockVersion } from './BlockVersion'
import { AnalysisResult } from './AnalysisResult'
import { Claim } from './Claim'
import { Publication } from './Publication'
import { ShareLink } from './ShareLink'
import { Session } from './Session'
import { PasswordReset } from './PasswordReset'
import { RecoveryCode } from './RecoveryCode'
import { Thread } from './Thread'
import { ThreadMessage } from './ThreadMessage'
import { Notification } from './Notification'

export { Newsroom, User, Membership, Invitation, AuditEvent, SignInAttempt, Dataset, DatasetColumn, Investigation, Block, BlockVersion, AnalysisResult, Claim, Publication, ShareLink, Session, PasswordReset, RecoveryCode, Thread, ThreadMessage, Notification }

/** Registers every model on `sequelize` and wires their associations. */
export function setupModels(sequelize: Sequelize) {
  for (const model of [Newsroom, User, Membership, Invitation, AuditEvent, SignInAttempt, Dataset, DatasetColumn, Investigation, Block, BlockVersion, AnalysisResult, Claim, Publication, ShareLink, Session, PasswordReset, RecoveryCode, Thread, ThreadMessage, Notification]) model.setup(sequelize)
  Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' })
  Membership.belongsTo(Newsroom, { foreignKey: 'newsroomId', as: 'newsroom' })
  User.hasMany(Membership, { foreignKey: 'userId', as: 'memberships' })
  Invitation.belongsTo(User, { foreignKey: 'invitedBy', as: 'inviter' })
  Invitation.belongsTo(Newsroom, { foreignKey: 'newsroomId', as: 'newsroom' })
  Dataset.hasMany(DatasetColumn, { foreignKey: 'datasetId', as: 'columns' })
  Dataset.belongsTo(User, { foreignKey: 'createdBy', as: 'creator' })
  Investigation.belongsTo(User, { foreignKey: 'updatedBy', as: 'editor' })
  Investigation.belongsTo(User, { foreignKey: 'createdBy', as: 'creator' })
  Investigation.hasMany(Block, { foreignKey: 'investigationId', as: 'blocks' })
}

import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, ForeignKey, NonAttribute, Sequelize } from 'sequelize'
import { ROLES } from '#shared/auth/roles'
import type { Role } from '#shared/auth/roles'
import type { Newsroom } from './Newsroom'
import type { User } from './User'

export class Invitation extends Model<InferAttributes<Invitation>, InferCreationAttributes<Invitation>> {
  declare id: CreationOptional<string>
  declare newsroomId: ForeignKey<Newsroom['id']>
  declare email: string
  declare role: Role
  declare tokenHash: string
  declare invitedBy: ForeignKey<User['id']>
  declare expiresAt: Date
  declare acceptedAt: Date | null
  declare revokedAt: Date | null
  declare createdAt: CreationOptional<Date>
  declare inviter?: NonAttribute<User>
  declare newsroom?: NonAttribute<Newsroom>

  static setup(sequelize: Sequelize) {
    Invitation.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      email: { type: DataTypes.TEXT, allowNull: false },
      role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
      tokenHash: { type: DataTypes.TEXT, allowNull: false },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      acceptedAt: { type: DataTypes.DATE, allowNull: true },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'invitations', underscored: true, updatedAt: false })
  }
}

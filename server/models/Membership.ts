import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, ForeignKey, NonAttribute, Sequelize } from 'sequelize'
import { ROLES } from '#shared/auth/roles'
import type { Role } from '#shared/auth/roles'
import type { Newsroom } from './Newsroom'
import type { User } from './User'

export class Membership extends Model<InferAttributes<Membership>, InferCreationAttributes<Membership>> {
  declare id: CreationOptional<string>
  declare newsroomId: ForeignKey<Newsroom['id']>
  declare userId: ForeignKey<User['id']>
  declare role: Role
  declare createdAt: CreationOptional<Date>
  declare user?: NonAttribute<User>
  declare newsroom?: NonAttribute<Newsroom>

  static setup(sequelize: Sequelize) {
    Membership.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'memberships', underscored: true, updatedAt: false })
  }
}

import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, ForeignKey, Sequelize } from 'sequelize'
import type { User } from './User'

export class Session extends Model<InferAttributes<Session>, InferCreationAttributes<Session>> {
  declare id: CreationOptional<string>
  declare userId: ForeignKey<User['id']>
  declare tokenHash: string
  declare secondFactor: boolean
  declare ip: string
  declare userAgent: string
  declare createdAt: CreationOptional<Date>
  declare lastSeenAt: CreationOptional<Date>
  declare expiresAt: Date
  declare endedAt: CreationOptional<Date | null>
  declare endedReason: CreationOptional<string | null>

  static setup(sequelize: Sequelize) {
    Session.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      userId: { type: DataTypes.UUID, allowNull: false },
      tokenHash: { type: DataTypes.TEXT, allowNull: false, unique: true },
      secondFactor: { type: DataTypes.BOOLEAN, allowNull: false },
      ip: { type: DataTypes.TEXT, allowNull: false },
      userAgent: { type: DataTypes.TEXT, allowNull: false },
      createdAt: DataTypes.DATE,
      lastSeenAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      endedAt: { type: DataTypes.DATE, allowNull: true },
      endedReason: { type: DataTypes.TEXT, allowNull: true },
    }, { sequelize, tableName: 'sessions', underscored: true, updatedAt: false })
  }
}

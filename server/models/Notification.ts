import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'
import type { NotificationKind } from '#shared/types/conversation'

export class Notification extends Model<InferAttributes<Notification>, InferCreationAttributes<Notification>> {
  declare id: CreationOptional<string>
  declare userId: string
  declare newsroomId: string
  declare investigationId: string
  declare kind: NotificationKind
  declare actorId: string | null
  declare anchor: CreationOptional<string>
  declare threadId: string | null
  declare excerpt: CreationOptional<string>
  declare createdAt: CreationOptional<Date>
  declare readAt: CreationOptional<Date | null>

  static setup(sequelize: Sequelize) {
    Notification.init({
      // BIGINT comes back as a string from pg.
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      userId: { type: DataTypes.UUID, allowNull: false },
      newsroomId: { type: DataTypes.UUID, allowNull: false },
      investigationId: { type: DataTypes.UUID, allowNull: false },
      kind: { type: DataTypes.TEXT, allowNull: false },
      actorId: DataTypes.UUID,
      anchor: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      threadId: DataTypes.UUID,
      excerpt: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      createdAt: DataTypes.DATE,
      readAt: DataTypes.DATE,
    }, { sequelize, tableName: 'notifications', underscored: true, updatedAt: false })
  }
}

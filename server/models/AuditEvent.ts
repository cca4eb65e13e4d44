import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'

export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<string>
  declare newsroomId: string
  declare investigationId: string | null
  declare actorId: string | null
  declare action: string
  declare subjectType: string
  declare subjectId: string | null
  declare detail: Record<string, unknown>
  declare createdAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    AuditEvent.init({
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      newsroomId: { type: DataTypes.UUID, allowNull: false },
      investigationId: { type: DataTypes.UUID, allowNull: true },
      actorId: { type: DataTypes.UUID, allowNull: true },
      action: { type: DataTypes.TEXT, allowNull: false },
      subjectType: { type: DataTypes.TEXT, allowNull: false },
      subjectId: { type: DataTypes.TEXT, allowNull: true },
      detail: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'audit_events', underscored: true, updatedAt: false })
  }
}

import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'
import type { ThreadSubjectType } from '#shared/types/conversation'

export class Thread extends Model<InferAttributes<Thread>, InferCreationAttributes<Thread>> {
  declare id: CreationOptional<string>
  declare investigationId: string
  declare subjectType: ThreadSubjectType
  declare subjectId: string
  declare blockId: string
  declare createdBy: string | null
  declare createdAt: CreationOptional<Date>
  declare resolvedBy: CreationOptional<string | null>
  declare resolvedAt: CreationOptional<Date | null>
  declare reopenedBy: CreationOptional<string | null>
  declare reopenedAt: CreationOptional<Date | null>

  static setup(sequelize: Sequelize) {
    Thread.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      investigationId: { type: DataTypes.UUID, allowNull: false },
      subjectType: { type: DataTypes.TEXT, allowNull: false },
      subjectId: { type: DataTypes.UUID, allowNull: false },
      blockId: { type: DataTypes.UUID, allowNull: false },
      createdBy: DataTypes.UUID,
      createdAt: DataTypes.DATE,
      resolvedBy: DataTypes.UUID,
      resolvedAt: DataTypes.DATE,
      reopenedBy: DataTypes.UUID,
      reopenedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'threads', underscored: true, updatedAt: false })
  }
}

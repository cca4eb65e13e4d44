import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'
import type { AnalysisSettings, ProseContent, ReviewStatus } from '#shared/types/investigation'

export class Block extends Model<InferAttributes<Block>, InferCreationAttributes<Block>> {
  declare id: CreationOptional<string>
  declare investigationId: string
  declare kind: 'prose' | 'analysis'
  declare position: number
  declare content: ProseContent | null
  declare settings: AnalysisSettings | null
  declare version: CreationOptional<number>
  declare createdBy: string
  declare updatedBy: CreationOptional<string | null>
  declare deletedAt: CreationOptional<Date | null>
  declare reviewStatus: CreationOptional<ReviewStatus>
  declare reviewNote: CreationOptional<string | null>
  declare reviewedBy: CreationOptional<string | null>
  declare reviewedAt: CreationOptional<Date | null>
  declare lockedBy: CreationOptional<string | null>
  declare lockedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    Block.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      investigationId: { type: DataTypes.UUID, allowNull: false },
      kind: { type: DataTypes.ENUM('prose', 'analysis'), allowNull: false },
      position: { type: DataTypes.INTEGER, allowNull: false },
      content: DataTypes.JSONB,
      settings: DataTypes.JSONB,
      version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      createdBy: { type: DataTypes.UUID, allowNull: false },
      updatedBy: DataTypes.UUID,
      deletedAt: DataTypes.DATE,
      reviewStatus: { type: DataTypes.ENUM('unreviewed', 'approved', 'sent-back'), allowNull: false, defaultValue: 'unreviewed' },
      reviewNote: DataTypes.TEXT,
      reviewedBy: DataTypes.UUID,
      reviewedAt: DataTypes.DATE,
      lockedBy: DataTypes.UUID,
      lockedAt: DataTypes.DATE,
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'blocks', underscored: true })
  }
}

import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'
import type { AnalysisSettings, ProseContent } from '#shared/types/investigation'
import type { BlockVersionChange } from '#shared/types/history'

/** One saved state of a block; rows are only ever added (the table's trigger refuses changes). */
export class BlockVersion extends Model<InferAttributes<BlockVersion>, InferCreationAttributes<BlockVersion>> {
  declare id: CreationOptional<string>
  declare blockId: string
  declare investigationId: string
  declare version: number
  declare kind: 'prose' | 'analysis'
  declare content: ProseContent | null
  declare settings: AnalysisSettings | null
  declare change: BlockVersionChange
  declare restoredFrom: CreationOptional<number | null>
  declare savedBy: string | null
  declare savedAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    BlockVersion.init({
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      blockId: { type: DataTypes.UUID, allowNull: false },
      investigationId: { type: DataTypes.UUID, allowNull: false },
      version: { type: DataTypes.INTEGER, allowNull: false },
      kind: { type: DataTypes.TEXT, allowNull: false },
      content: DataTypes.JSONB,
      settings: DataTypes.JSONB,
      change: { type: DataTypes.TEXT, allowNull: false },
      restoredFrom: DataTypes.INTEGER,
      savedBy: DataTypes.UUID,
      savedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'block_versions', underscored: true, createdAt: 'savedAt', updatedAt: false })
  }
}

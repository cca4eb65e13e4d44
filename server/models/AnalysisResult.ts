import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'
import type { TestResult } from '#shared/digits'

export class AnalysisResult extends Model<InferAttributes<AnalysisResult>, InferCreationAttributes<AnalysisResult>> {
  declare cacheKey: string
  declare datasetId: string
  declare result: TestResult
  declare createdAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    AnalysisResult.init({
      cacheKey: { type: DataTypes.TEXT, primaryKey: true },
      datasetId: { type: DataTypes.UUID, allowNull: false },
      result: { type: DataTypes.JSONB, allowNull: false },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'analysis_results', underscored: true, updatedAt: false })
  }
}

import { Model, DataTypes } from 'sequelize'
import type { CreationOptional, InferAttributes, InferCreationAttributes, Sequelize } from 'sequelize'
import type { ColumnProfile as SuitabilityProfile, DuplicateCounts } from '#shared/digits'
import type { DateReadingDTO, ValueLadder } from '#shared/types/dataset'

export class DatasetColumn extends Model<InferAttributes<DatasetColumn>, InferCreationAttributes<DatasetColumn>> {
  declare datasetId: string
  declare position: number
  declare name: string
  declare kind: string
  declare decimalMark: string | null
  declare parsed: number
  declare blank: number
  declare unreadable: number
  declare zero: number
  declare negative: number
  declare min: string | null
  declare max: string | null
  declare magnitudeSpan: number | null
  declare samples: string[]
  /** Whether digit records carry this text column as group codes (see group-codes.ts). */
  declare coded: CreationOptional<boolean>
  /** Text column positions (-1: none) whose digit counts were kept at import (digit-cube.ts); null: scan. */
  declare cubeGroups: CreationOptional<number[] | null>
  /** Pairs of text column positions counted together (digit-cube.ts), one after the other; null: none. */
  declare cubePairs: CreationOptional<number[] | null>
  /** A number column's value ladder, whose rungs the cube counts (value-ladder.ts); null: range filters scan. */
  declare ladder: CreationOptional<ValueLadder | null>
  /** Per sign, the suitability facts of the whole column (null for text columns). */
  declare profiles: CreationOptional<Record<'positive' | 'negative', SuitabilityProfile | null> | null>

  /** A date column: how its dates were read at import. */
  declare dates: CreationOptional<DateReadingDTO | null>
  /** A number column: per sign, its repeated values over the whole column, counted once after the import. */
  declare repeats: CreationOptional<Record<'positive' | 'negative', Omit<DuplicateCounts, 'status'>> | null>

  static setup(sequelize: Sequelize) {
    DatasetColumn.init({
      datasetId: { type: DataTypes.UUID, primaryKey: true },
      position: { type: DataTypes.SMALLINT, primaryKey: true },
      name: { type: DataTypes.TEXT, allowNull: false },
      kind: { type: DataTypes.TEXT, allowNull: false },
      decimalMark: DataTypes.CHAR(1),
      parsed: DataTypes.INTEGER,
      blank: DataTypes.INTEGER,
      unreadable: DataTypes.INTEGER,
      zero: DataTypes.INTEGER,
      negative: DataTypes.INTEGER,
      min: DataTypes.DECIMAL,
      max: DataTypes.DECIMAL,
      magnitudeSpan: DataTypes.REAL,
      samples: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
      profiles: { type: DataTypes.JSONB, allowNull: true },
      coded: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      cubeGroups: { type: DataTypes.ARRAY(DataTypes.SMALLINT), allowNull: true },
      cubePairs: { type: DataTypes.ARRAY(DataTypes.SMALLINT), allowNull: true },
      ladder: { type: DataTypes.JSONB, allowNull: true },
      dates: { type: DataTypes.JSONB, allowNull: true },
      repeats: { type: DataTypes.JSONB, allowNull: true },
    }, { sequelize, tableName: 'dataset_columns', underscored: true, timestamps: false })
  }
}

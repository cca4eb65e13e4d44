import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'
import type { ColumnReadings } from '#shared/types/dataset'

export type DatasetStatus = 'importing' | 'ready' | 'failed'

export class Dataset extends Model<InferAttributes<Dataset>, InferCreationAttributes<Dataset>> {
  declare id: CreationOptional<string>
  declare newsroomId: string
  declare title: string
  declare sourceNote: string | null
  declare sourceUrl: string | null
  declare obtainedOn: string | null
  declare originalName: string
  declare format: string
  declare compression: CreationOptional<'gzip' | 'zip' | null>
  declare archiveEntry: CreationOptional<string | null>
  declare sheet: CreationOptional<string | null>
  declare sheets: CreationOptional<string[] | null>
  declare sha256: string
  declare byteSize: number
  declare storageKey: string
  declare status: CreationOptional<DatasetStatus>
  declare error: CreationOptional<string | null>
  declare progress: CreationOptional<number>
  declare rowCount: CreationOptional<number | null>
  declare raggedRows: CreationOptional<number>
  declare encoding: CreationOptional<string | null>
  declare delimiter: CreationOptional<string | null>
  declare replacesId: string | null
  /** The first reading of the same upload, when this one re-reads it (migration 0060). */
  declare readingOf: CreationOptional<string | null>
  declare readingNo: CreationOptional<number>
  declare columnReadings: CreationOptional<ColumnReadings>
  declare archivedAt: CreationOptional<Date | null>
  declare createdBy: string
  declare createdAt: CreationOptional<Date>
  declare readyAt: CreationOptional<Date | null>

  static setup(sequelize: Sequelize) {
    Dataset.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      newsroomId: { type: DataTypes.UUID, allowNull: false },
      title: { type: DataTypes.TEXT, allowNull: false },
      sourceNote: DataTypes.TEXT,
      sourceUrl: DataTypes.TEXT,
      obtainedOn: DataTypes.DATEONLY,
      originalName: { type: DataTypes.TEXT, allowNull: false },
      format: { type: DataTypes.TEXT, allowNull: false },
      compression: DataTypes.TEXT,
      archiveEntry: DataTypes.TEXT,
      sheet: DataTypes.TEXT,
      sheets: DataTypes.ARRAY(DataTypes.TEXT),
      sha256: { type: DataTypes.TEXT, allowNull: false },
      byteSize: { type: DataTypes.BIGINT, allowNull: false, get() {
        return Number(this.getDataValue('byteSize'))
      } },
      storageKey: { type: DataTypes.TEXT, allowNull: false },
      status: { type: DataTypes.ENUM('importing', 'ready', 'failed'), allowNull: false, defaultValue: 'importing' },
      error: DataTypes.TEXT,
      progress: { type: DataTypes.REAL, allowNull: false, defaultValue: 0 },
      rowCount: DataTypes.INTEGER,
      raggedRows: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      encoding: DataTypes.TEXT,
      delimiter: DataTypes.TEXT,
      replacesId: DataTypes.UUID,
      readingOf: DataTypes.UUID,
      readingNo: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      columnReadings: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      archivedAt: DataTypes.DATE,
      createdBy: { type: DataTypes.UUID, allowNull: false },
      createdAt: DataTypes.DATE,
      readyAt: DataTypes.DATE,
    }, { sequelize, tableName: 'datasets', underscored: true, updatedAt: false })
  }
}

import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'
import type { PublishedSnapshot } from '#shared/types/publication'

export class Publication extends Model<InferAttributes<Publication>, InferCreationAttributes<Publication>> {
  declare id: CreationOptional<string>
  declare investigationId: string
  declare snapshot: PublishedSnapshot
  declare overrideReason: string | null
  declare disputedReason: CreationOptional<string | null>
  declare followUpConfirmedBy: CreationOptional<string | null>
  declare publishedBy: string
  declare publishedAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    Publication.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      investigationId: { type: DataTypes.UUID, allowNull: false },
      snapshot: { type: DataTypes.JSONB, allowNull: false },
      overrideReason: DataTypes.TEXT,
      disputedReason: DataTypes.TEXT,
      followUpConfirmedBy: DataTypes.UUID,
      publishedBy: { type: DataTypes.UUID, allowNull: false },
      publishedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'publications', underscored: true, timestamps: false })
  }
}

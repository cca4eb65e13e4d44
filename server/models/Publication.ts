import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'
import type { PublishedSnapshot } from '#shared/types/publication'
import type { FrozenBlock } from '#shared/types/history'

export class Publication extends Model<InferAttributes<Publication>, InferCreationAttributes<Publication>> {
  declare id: CreationOptional<string>
  declare investigationId: string
  declare snapshot: PublishedSnapshot
  /** The block versions the snapshot froze, in order (null for publications made before history was kept). */
  declare blockVersions: CreationOptional<FrozenBlock[] | null>
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
      blockVersions: DataTypes.JSONB,
      overrideReason: DataTypes.TEXT,
      disputedReason: DataTypes.TEXT,
      followUpConfirmedBy: DataTypes.UUID,
      publishedBy: { type: DataTypes.UUID, allowNull: false },
      publishedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'publications', underscored: true, timestamps: false })
  }
}

import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'

export type InvestigationStatus = 'draft' | 'in-review' | 'published'

export class Investigation extends Model<InferAttributes<Investigation>, InferCreationAttributes<Investigation>> {
  declare id: CreationOptional<string>
  declare newsroomId: string
  declare title: string
  declare status: CreationOptional<InvestigationStatus>
  declare layoutVersion: CreationOptional<number>
  declare titleVersion: CreationOptional<number>
  declare createdBy: string
  declare updatedBy: CreationOptional<string | null>
  declare archivedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    Investigation.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      newsroomId: { type: DataTypes.UUID, allowNull: false },
      title: { type: DataTypes.TEXT, allowNull: false },
      status: { type: DataTypes.ENUM('draft', 'in-review', 'published'), allowNull: false, defaultValue: 'draft' },
      layoutVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      titleVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      createdBy: { type: DataTypes.UUID, allowNull: false },
      updatedBy: DataTypes.UUID,
      archivedAt: DataTypes.DATE,
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'investigations', underscored: true })
  }
}

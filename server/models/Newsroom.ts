import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'

export class Newsroom extends Model<InferAttributes<Newsroom>, InferCreationAttributes<Newsroom>> {
  declare id: CreationOptional<string>
  declare name: string
  /** Four eyes: the approver of a method or verifier of a claim is never its author. */
  declare fourEyes: CreationOptional<boolean>
  declare createdAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    Newsroom.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      name: { type: DataTypes.TEXT, allowNull: false },
      fourEyes: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'newsrooms', underscored: true, updatedAt: false })
  }
}

import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<string>
  declare email: string
  declare name: string
  declare passwordHash: string
  declare notifyByEmail: CreationOptional<boolean>
  declare emailMentions: CreationOptional<boolean>
  declare totpSecret: CreationOptional<string | null>
  declare totpPendingSecret: CreationOptional<string | null>
  declare totpLastStep: CreationOptional<string | null>
  declare createdAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    User.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      email: { type: DataTypes.TEXT, allowNull: false, unique: true },
      name: { type: DataTypes.TEXT, allowNull: false },
      passwordHash: { type: DataTypes.TEXT, allowNull: false },
      notifyByEmail: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      emailMentions: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      totpSecret: { type: DataTypes.TEXT, allowNull: true },
      totpPendingSecret: { type: DataTypes.TEXT, allowNull: true },
      // BIGINT comes back as a string from pg.
      totpLastStep: { type: DataTypes.BIGINT, allowNull: true },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'users', underscored: true, updatedAt: false })
  }
}

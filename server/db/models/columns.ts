/** Attribute definitions shared by the models. */
import { DataTypes } from 'sequelize';

// Sequelize writes into attribute definitions (e.g. their column name), so every attribute gets its own object.
export const col = {
  id: () => ({ type: DataTypes.STRING(36), primaryKey: true }),
  orgId: () => ({ type: DataTypes.STRING(36), allowNull: false }),
  nullableDate: () => ({ type: DataTypes.DATE, allowNull: true }),
  nullableId: () => ({ type: DataTypes.STRING(36), allowNull: true }),
};
export const timestamps = () => ({
  createdAt: { type: DataTypes.DATE, allowNull: false },
  updatedAt: { type: DataTypes.DATE, allowNull: false },
});

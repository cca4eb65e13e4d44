/** The dataset's own partition tables; the name comes from its uuid, never from user input. */
export function partitionNames(datasetId: string) {
  const hex = datasetId.replaceAll('-', '')
  if (!/^[0-9a-f]{32}$/.test(hex)) throw new Error('not a dataset id')
  return { rows: `dataset_rows_${hex}`, digits: `digit_records_${hex}`, groupValues: `import_group_values_${hex}` }
}

export default defineAppConfig({
  caution: 'A deviation says "look here", never "fraud". Check the records, ask the people involved, and take it to legal review before naming anyone.',
})

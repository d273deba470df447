// public route: current records per class and distance, each with its sealed dossier.
export default defineEventHandler(() => recordBook())

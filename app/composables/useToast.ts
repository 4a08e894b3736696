export const useToast = () => useToastStore()
